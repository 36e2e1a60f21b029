import { describe, it, expect } from 'vitest';
import { computeCorrelation, computePhase, countQuadrature, decodeQuadratureX4, foldLag } from './phase';
import type { EdgeTrain } from './crossings';

const ms = (xs: number[]): number[] => xs.map((x) => x / 1000);

describe('computePhase', () => {
  // REFERENCES.md section 9, "From edge times (ms)" check values (b).
  it('A rise 0 and 10 ms, B rise 2.5 ms: phase 90.000 degrees, A leads (REFERENCES.md section 9 (b))', () => {
    const p = computePhase(ms([0, 10]), ms([2.5]));
    expect(p.lagDeg).toBeCloseTo(90, 3);
    expect(p.phaseDeg).toBeCloseTo(90, 3);
    expect(p.direction).toBe('a_leads');
    expect(p.cycles).toBe(1);
  });

  it('B rise 3.2 ms in a 10 ms A period: 115.2 degrees (REFERENCES.md section 9 (b))', () => {
    const p = computePhase(ms([0, 10]), ms([3.2]));
    expect(p.lagDeg).toBeCloseTo(115.2, 6);
    expect(p.direction).toBe('a_leads');
  });

  it('A rise 0 and 8 ms, B rise 6 ms: 270 degrees (= -90, B leads) (REFERENCES.md section 9 (b))', () => {
    const p = computePhase(ms([0, 8]), ms([6]));
    expect(p.lagDeg).toBeCloseTo(270, 6);
    expect(p.phaseDeg).toBeCloseTo(90, 6);
    expect(p.direction).toBe('b_leads');
  });

  it('averages lags around 0/360 on the circle (359 and 1 degrees give about 0)', () => {
    const p = computePhase(ms([0, 10, 20, 30]), ms([9.9722, 20.0278, 29.9722]));
    expect(p.phaseDeg).toBeLessThan(0.5);
    expect(p.direction).toBe('none');
    expect(p.spreadDeg).toBeGreaterThan(0.5);
  });

  it('skips a cycle in which B has no rising edge (B dropout)', () => {
    const p = computePhase(ms([0, 10, 20, 30]), ms([2.5, 22.5]));
    expect(p.cycles).toBe(2);
    expect(p.phaseDeg).toBeCloseTo(90, 6);
  });

  it('leaves out an A period holding a missing A pulse (20 ms among 10 ms periods)', () => {
    // Without the check the 20 ms period would give 2.5 / 20 x 360 = 45 degrees and pull the mean.
    const p = computePhase(ms([0, 10, 30, 40, 50]), ms([2.5, 12.5, 22.5, 32.5, 42.5]));
    expect(p.cycles).toBe(3);
    expect(p.phaseDeg).toBeCloseTo(90, 6);
  });

  it('uses B\'s period as the reference when A misses so many pulses that its own median misleads', () => {
    // A periods 20, 20, 10, 10 (median 15 ms): only the 10 ms periods are whole; B's period is 10 ms.
    const rising = ms([0, 20, 40, 50, 60]);
    const b = ms([2.5, 12.5, 22.5, 32.5, 42.5, 52.5]);
    expect(computePhase(rising, b).cycles).toBe(0);
    const p = computePhase(rising, b, 0.01);
    expect(p.cycles).toBe(2);
    expect(p.phaseDeg).toBeCloseTo(90, 6);
  });

  it('reports phase 0 and direction none with nothing to pair', () => {
    const p = computePhase(ms([0]), ms([2.5]));
    expect(p).toMatchObject({ phaseDeg: 0, direction: 'none', cycles: 0 });
    expect(Number.isNaN(p.lagDeg)).toBe(true);
  });
});

describe('foldLag', () => {
  it('folds lags into 0-180 with a direction', () => {
    expect(foldLag(90)).toEqual({ phaseDeg: 90, direction: 'a_leads' });
    expect(foldLag(200)).toEqual({ phaseDeg: 160, direction: 'b_leads' });
    expect(foldLag(-90)).toEqual({ phaseDeg: 90, direction: 'b_leads' });
    expect(foldLag(2)).toEqual({ phaseDeg: 2, direction: 'none' });
    expect(foldLag(178)).toEqual({ phaseDeg: 178, direction: 'none' });
    expect(foldLag(6)).toEqual({ phaseDeg: 6, direction: 'a_leads' });
  });
});

describe('decodeQuadratureX4 (REFERENCES.md section 9 decoder check values (b))', () => {
  it('forward 00 10 11 01 00 counts +4', () => {
    expect(decodeQuadratureX4([0b00, 0b10, 0b11, 0b01, 0b00])).toEqual({ count: 4, invalidTransitions: 0 });
  });
  it('reverse 00 01 11 10 00 counts -4', () => {
    expect(decodeQuadratureX4([0b00, 0b01, 0b11, 0b10, 0b00])).toEqual({ count: -4, invalidTransitions: 0 });
  });
  it('two forward cycles count +8', () => {
    expect(decodeQuadratureX4([0, 2, 3, 1, 0, 2, 3, 1, 0]).count).toBe(8);
  });
  it('00 10 11 01 11 counts +2', () => {
    expect(decodeQuadratureX4([0b00, 0b10, 0b11, 0b01, 0b11])).toEqual({ count: 2, invalidTransitions: 0 });
  });
  it('00 -> 11 is invalid: counted as an error, position unchanged', () => {
    expect(decodeQuadratureX4([0b00, 0b11])).toEqual({ count: 0, invalidTransitions: 1 });
  });
});

describe('countQuadrature', () => {
  const t = (times: number[], firstRising: boolean): EdgeTrain => ({
    timesS: Float64Array.from(times),
    firstRising,
    initialHigh: !firstRising,
  });
  it('counts +4 per cycle when A leads and -4 when B leads', () => {
    const a = t([0, 5, 10, 15], true);
    const b = t([2.5, 7.5, 12.5, 17.5], true);
    expect(countQuadrature(a, b, 0.01)).toEqual({ count: 8, invalidTransitions: 0 });
    expect(countQuadrature(b, a, 0.01)).toEqual({ count: -8, invalidTransitions: 0 });
  });
  it('counts simultaneous edges of both channels as invalid', () => {
    const a = t([0, 5, 10, 15], true);
    expect(countQuadrature(a, t([0.001, 5.001, 10, 15], true), 0.01)).toEqual({ count: 0, invalidTransitions: 4 });
  });
});

describe('computeCorrelation', () => {
  it('is 1 for identical, -1 for inverted and 0 for a constant channel', () => {
    const a = [0, 5, 5, 0, 0, 5, 5, 0];
    expect(computeCorrelation(a, a)).toBeCloseTo(1, 12);
    expect(computeCorrelation(a, a.map((x) => 5 - x))).toBeCloseTo(-1, 12);
    expect(computeCorrelation(a, a.map(() => 2))).toBe(0);
  });
  it('is 0 for ideal square waves a quarter period apart', () => {
    const a = [1, 1, 0, 0, 1, 1, 0, 0];
    const b = [0, 1, 1, 0, 0, 1, 1, 0];
    expect(computeCorrelation(a, b)).toBeCloseTo(0, 12);
  });
  it('does not lose precision on large offsets', () => {
    const a = [1000, 1005, 1005, 1000, 1000, 1005];
    const b = [1000.001, 1005.001, 1005.001, 1000.001, 1000.001, 1005.001];
    expect(computeCorrelation(a, b)).toBeCloseTo(1, 9);
  });
});
