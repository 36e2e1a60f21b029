import { describe, it, expect } from 'vitest';
import { captureToCsv, createRng, generateCapture } from './generate';

describe('createRng', () => {
  it('is deterministic per seed and uniform in [0, 1)', () => {
    const a = createRng(123);
    const b = createRng(123);
    const xs = Array.from({ length: 10_000 }, () => a());
    expect(xs.slice(0, 5)).toEqual(Array.from({ length: 5 }, () => b()));
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...xs)).toBeLessThan(1);
    const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.01);
    expect(createRng(124)()).not.toBe(createRng(123)());
  });
});

describe('generateCapture', () => {
  const spec = { sampleRateHz: 10_000, samples: 2_000, freqHz: 100, noiseV: 0.05, seed: 8 };

  it('is deterministic for a seed and differs between seeds', () => {
    expect(Array.from(generateCapture(spec).a)).toEqual(Array.from(generateCapture(spec).a));
    expect(Array.from(generateCapture({ ...spec, seed: 9 }).a)).not.toEqual(Array.from(generateCapture(spec).a));
  });

  it('gives noise of the requested standard deviation (stuck channel, within 5%)', () => {
    const g = generateCapture({ ...spec, samples: 20_000, noiseV: 0.1, b: { stuck: 1.5 } });
    const mean = g.b.reduce((s, x) => s + x, 0) / g.b.length;
    const sd = Math.sqrt(g.b.reduce((s, x) => s + (x - mean) ** 2, 0) / g.b.length);
    expect(Math.abs(mean - 1.5)).toBeLessThan(0.005);
    expect(Math.abs(sd / 0.1 - 1)).toBeLessThan(0.05);
  });

  it('writes time from startS at the sample rate and levels as given', () => {
    const g = generateCapture({ sampleRateHz: 1000, samples: 100, freqHz: 10, startS: -0.05, lowV: 1, highV: 11, riseS: 0 });
    expect(g.time[0]).toBe(-0.05);
    expect(g.time[99]).toBeCloseTo(0.049, 12);
    expect(Math.min(...g.a)).toBe(1);
    expect(Math.max(...g.a)).toBe(11);
  });

  it('puts A high for the duty share of each cycle, B a quarter cycle later', () => {
    // 10 Hz at 1 kHz, startCycle 0: A high for samples 0-49 of each 100; B (90 degrees later) 25-74.
    const g = generateCapture({ sampleRateHz: 1000, samples: 200, freqHz: 10, startCycle: 0, riseS: 0, lowV: 0, highV: 1 });
    expect(g.a[0]).toBe(1);
    expect(g.a[49]).toBe(1);
    expect(g.a[50]).toBe(0);
    expect(g.b[24]).toBe(0);
    expect(g.b[25]).toBe(1);
    expect(g.b[74]).toBe(1);
    expect(g.b[75]).toBe(0);
  });

  it('makes bridged channels carry the same waveform', () => {
    const g = generateCapture({ ...spec, noiseV: 0, bridged: 'wired-and' });
    expect(Array.from(g.a)).toEqual(Array.from(g.b));
  });

  it('rejects bad specs', () => {
    expect(() => generateCapture({ ...spec, samples: 1 })).toThrow(RangeError);
    expect(() => generateCapture({ ...spec, freqHz: 0 })).toThrow(RangeError);
  });
});

describe('captureToCsv', () => {
  const g = generateCapture({ sampleRateHz: 1000, samples: 3, freqHz: 10, startCycle: 0, riseS: 0, lowV: 0.25, highV: 4.75 });

  it('writes the default variant: paren header, comma, seconds, volts', () => {
    expect(captureToCsv(g)).toBe('time (s),A (V),B (V)\n0.00000,4.7500,0.2500\n0.00100,4.7500,0.2500\n0.00200,4.7500,0.2500\n');
  });

  it('writes semicolon + decimal comma + ms + mV with a preamble, CRLF and BOM', () => {
    const s = captureToCsv(g, { delimiter: ';', decimalComma: true, timeUnit: 'ms', millivolts: true, preamble: ['Scope'], crlf: true, bom: true, header: 'bracket' });
    expect(s.split('\r\n').slice(0, 3)).toEqual(['\uFEFFScope', 'Time[ms];CH1[mV];CH2[mV]', '0,00;4750,0;250,0']);
  });

  it('writes underscore, custom and no headers, and tabs', () => {
    expect(captureToCsv(g, { header: 'underscore', timeUnit: 'us' }).split('\n')[0]).toBe('t_us,a_V,b_V');
    expect(captureToCsv(g, { header: { line: 'x;y;z' }, delimiter: ';' }).split('\n')[0]).toBe('x;y;z');
    expect(captureToCsv(g, { header: 'none', delimiter: '\t' }).split('\n')[0]).toBe('0.00000\t4.7500\t0.2500');
  });

  it('refuses a decimal comma with a comma delimiter', () => {
    expect(() => captureToCsv(g, { decimalComma: true })).toThrow(RangeError);
  });
});
