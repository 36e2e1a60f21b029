import { describe, expect, it } from 'vitest';
import { formatChangePct, formatDeg, formatHz, formatPct, formatRpm, formatSampleRate, formatSpan, formatVolts, formatWindowBounds } from './format';

describe('trace figure formatting', () => {
  it('formats frequencies to four significant digits, switching to kHz', () => {
    expect(formatHz(200)).toBe('200.0 Hz');
    expect(formatHz(47.123)).toBe('47.12 Hz');
    expect(formatHz(1234.5)).toBe('1.235 kHz');
    expect(formatHz(12_500)).toBe('12.50 kHz');
    expect(formatHz(0)).toBe('–');
  });
  it('formats sample rates, durations, volts, percent, degrees, rpm and changes', () => {
    expect(formatSampleRate(1_000_000)).toBe('1 MS/s');
    expect(formatSampleRate(20_480)).toBe('20.5 kS/s');
    expect(formatSampleRate(500)).toBe('500 S/s');
    expect(formatVolts(4.9812)).toBe('4.98 V');
    expect(formatPct(49.84)).toBe('49.8%');
    expect(formatPct(NaN)).toBe('–');
    expect(formatDeg(90.04)).toBe('90.0°');
    expect(formatRpm(6000)).toBe('6,000 rpm');
    expect(formatChangePct(-12.5)).toBe('−12.5%');
    expect(formatChangePct(3)).toBe('+3.0%');
  });
});


describe('formatSpan (plot readout)', () => {
  it('gives three significant digits in the largest unit that keeps the number at 1 or more', () => {
    expect(formatSpan(0.2)).toBe('200 ms');
    expect(formatSpan(0.09999999)).toBe('100 ms');
    expect(formatSpan(0.05)).toBe('50.0 ms');
    expect(formatSpan(0.0009999)).toBe('1.00 ms');
    expect(formatSpan(0.000473)).toBe('473 µs');
    expect(formatSpan(1.5)).toBe('1.50 s');
    expect(formatSpan(12.345)).toBe('12.3 s');
    expect(formatSpan(0)).toBe('0 ms');
  });
});

describe('formatWindowBounds (plot window caption)', () => {
  it('gives bounds that differ by the span shown', () => {
    // 12 samples at 100 kS/s: a 120 µs window from 16.40 ms (the case where "16.4 ms to 16.5 ms" read as 100 µs).
    expect(formatWindowBounds(0.0164, 0.01652)).toEqual({ from: '16.400 ms', to: '16.520 ms' });
    expect(formatWindowBounds(0, 0.12)).toEqual({ from: '0 ms', to: '120 ms' });
    expect(formatWindowBounds(0.05, 0.15)).toEqual({ from: '50 ms', to: '150 ms' });
    // Half of a 0.19999 s capture: the readout says 100 ms shown, so the bounds are whole milliseconds too.
    expect(formatWindowBounds(0.0499975, 0.1499925)).toEqual({ from: '50 ms', to: '150 ms' });
    expect(formatWindowBounds(0.5, 1.25)).toEqual({ from: '0.500 s', to: '1.250 s' });
    expect(formatWindowBounds(0.00002, 0.0003)).toEqual({ from: '20 µs', to: '300 µs' });
  });
});
