/**
 * Seeded randomness for the Monte Carlo replicates and the fleet generator: pure-rand's xoroshiro128+ behind a
 * small interface, seed derivation from text, Walker alias tables for multinomial draws, and Poisson draws.
 */
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';

/** A seeded stream of uniform numbers. */
export interface Random {
  /** Uniform 32-bit unsigned integer. */
  nextUint32(): number;
  /** Uniform double in [0, 1) with 53 random bits. */
  nextDouble(): number;
}

const TWO_POW_32 = 4294967296;
const TWO_POW_53 = 9007199254740992;

/** Seeded xoroshiro128+ stream (pure-rand); the same seed always gives the same sequence. */
export function createRandom(seed: number): Random {
  const gen = xoroshiro128plus(seed | 0);
  return {
    nextUint32: () => gen.next() >>> 0,
    nextDouble: () => {
      const hi = gen.next() >>> 5; // 27 bits
      const lo = gen.next() >>> 6; // 26 bits
      return (hi * 67108864 + lo) / TWO_POW_53;
    },
  };
}

/** 32-bit seed derived from a base seed and a label (FNV-1a, then murmur3's finaliser). */
export function deriveSeed(seed: number, label: string): number {
  let h = 0x811c9dc5 ^ (seed | 0);
  const text = `${seed}|${label}`;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h | 0;
}

/** Walker alias table for drawing bin indices with given weights in O(1) each. */
export interface AliasTable {
  size: number;
  /** Acceptance threshold per bin, scaled to [0, 1). */
  accept: Float64Array;
  alias: Int32Array;
}

/** Build an alias table (Vose's method) from non-negative weights with a positive sum. */
export function createAliasTable(weights: ArrayLike<number>): AliasTable {
  const size = weights.length;
  let total = 0;
  for (let i = 0; i < size; i++) {
    const w = weights[i] as number;
    if (!(w >= 0)) throw new RangeError('weights must be non-negative');
    total += w;
  }
  if (!(total > 0)) throw new RangeError('weights must have a positive sum');
  const scaled = new Float64Array(size);
  for (let i = 0; i < size; i++) scaled[i] = ((weights[i] as number) * size) / total;
  const accept = new Float64Array(size);
  const alias = new Int32Array(size);
  const small: number[] = [];
  const large: number[] = [];
  for (let i = 0; i < size; i++) ((scaled[i] as number) < 1 ? small : large).push(i);
  while (small.length > 0 && large.length > 0) {
    const s = small.pop() as number;
    const l = large.pop() as number;
    accept[s] = scaled[s] as number;
    alias[s] = l;
    scaled[l] = (scaled[l] as number) + (scaled[s] as number) - 1;
    ((scaled[l] as number) < 1 ? small : large).push(l);
  }
  for (const i of large) {
    accept[i] = 1;
    alias[i] = i;
  }
  for (const i of small) {
    accept[i] = 1;
    alias[i] = i;
  }
  return { size, accept, alias };
}

/**
 * Add `draws` multinomial draws over the alias table's bins into `counts` (one 32-bit number per draw: its high
 * bits pick the column, the rest decide between the column and its alias).
 */
export function drawMultinomialInto(table: AliasTable, draws: number, random: Random, counts: Int32Array): void {
  const { size, accept, alias } = table;
  for (let k = 0; k < draws; k++) {
    const x = (random.nextUint32() * size) / TWO_POW_32;
    const column = x | 0;
    counts[(x - column < (accept[column] as number) ? column : (alias[column] as number))]++;
  }
}

/** One Poisson(mean) draw: inversion for means up to 30, sums of Poisson(30) pieces above (exact either way). */
export function drawPoisson(mean: number, random: Random): number {
  if (!(mean >= 0)) throw new RangeError('mean must be non-negative');
  let remaining = mean;
  let total = 0;
  while (remaining > 30) {
    total += drawPoissonSmall(30, random);
    remaining -= 30;
  }
  return total + drawPoissonSmall(remaining, random);
}

function drawPoissonSmall(mean: number, random: Random): number {
  if (mean === 0) return 0;
  const u = random.nextDouble();
  let k = 0;
  let p = Math.exp(-mean);
  let cumulative = p;
  while (u >= cumulative && k < 1000) {
    k++;
    p *= mean / k;
    cumulative += p;
  }
  return k;
}
