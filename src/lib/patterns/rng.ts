/**
 * Seeded randomness for the Monte Carlo replicates and the fleet generator: xoshiro128** (Blackman & Vigna) seeded
 * through pure-rand's xoroshiro128+, seed derivation from text, Walker alias tables for multinomial draws, and Poisson draws.
 */
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';

/** A seeded stream of uniform numbers. */
export interface Random {
  /** Uniform 32-bit unsigned integer. */
  nextUint32(): number;
  /** Uniform double in [0, 1) with 53 random bits. */
  nextDouble(): number;
  /** xoshiro128** state (four 32-bit words), read and written in place by the hot loops. */
  readonly state: Int32Array;
}

const TWO_POW_32 = 4294967296;
const TWO_POW_53 = 2 ** 53;

/**
 * Seeded stream: pure-rand's xoroshiro128+ expands the seed into the state of a xoshiro128** generator, whose
 * state lives in a typed array so that the Monte Carlo loop can keep it in local variables.
 */
export function createRandom(seed: number): Random {
  const seeder = xoroshiro128plus(seed | 0);
  const state = new Int32Array(4);
  for (let i = 0; i < 4; i++) state[i] = seeder.next();
  if (((state[0] as number) | (state[1] as number) | (state[2] as number) | (state[3] as number)) === 0) state[0] = 1;
  const nextUint32 = (): number => {
    let s0 = state[0] as number;
    let s1 = state[1] as number;
    let s2 = state[2] as number;
    let s3 = state[3] as number;
    const m = Math.imul(s1, 5);
    const result = Math.imul((m << 7) | (m >>> 25), 9);
    const t = s1 << 9;
    s2 ^= s0;
    s3 ^= s1;
    s1 ^= s2;
    s0 ^= s3;
    s2 ^= t;
    s3 = (s3 << 11) | (s3 >>> 21);
    state[0] = s0;
    state[1] = s1;
    state[2] = s2;
    state[3] = s3;
    return result >>> 0;
  };
  return {
    state,
    nextUint32,
    nextDouble: () => {
      const hi = nextUint32() >>> 5; // 27 bits
      const lo = nextUint32() >>> 6; // 26 bits
      return (hi * 67108864 + lo) / TWO_POW_53;
    },
  };
}

/** 32-bit seed derived from a base seed and a label (FNV-1a, then murmur3's finaliser). */
export function deriveSeed(seed: number, label: string): number {
  // NOTE: the seed enters only through the text; xor-ing it into the offset basis as well made seeds 1 and 2 collide.
  let h = 0x811c9dc5;
  const text = `${seed | 0}|${label}`;
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
 * Add `draws` multinomial draws over the alias table's bins into `counts`: one xoshiro128** output per draw, its
 * high bits pick the column and the rest decide between the column and its alias. The generator state is kept in
 * locals for the loop (same sequence as random.nextUint32()).
 */
export function drawMultinomialInto(table: AliasTable, draws: number, random: Random, counts: Int32Array): void {
  const { size, accept, alias } = table;
  const state = random.state;
  let s0 = state[0] as number;
  let s1 = state[1] as number;
  let s2 = state[2] as number;
  let s3 = state[3] as number;
  const scale = size / TWO_POW_32;
  for (let k = 0; k < draws; k++) {
    const m = Math.imul(s1, 5);
    const out = Math.imul((m << 7) | (m >>> 25), 9) >>> 0;
    const t = s1 << 9;
    s2 ^= s0;
    s3 ^= s1;
    s1 ^= s2;
    s0 ^= s3;
    s2 ^= t;
    s3 = (s3 << 11) | (s3 >>> 21);
    const x = out * scale;
    const column = x | 0;
    const bin = x - column < (accept[column] as number) ? column : (alias[column] as number);
    counts[bin] = (counts[bin] as number) + 1;
  }
  state[0] = s0;
  state[1] = s1;
  state[2] = s2;
  state[3] = s3;
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
