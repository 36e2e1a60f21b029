import { describe, expect, it } from 'vitest';
import { formatChangePct, formatDeg, formatDuration, formatHz, formatPct, formatRpm, formatSampleRate, formatVolts } from './format';

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
    expect(formatDuration(0.2)).toBe('200 ms');
    expect(formatDuration(1.25)).toBe('1.25 s');
    expect(formatDuration(0.00085)).toBe('850 µs');
    expect(formatVolts(4.9812)).toBe('4.98 V');
    expect(formatPct(49.84)).toBe('49.8%');
    expect(formatPct(NaN)).toBe('–');
    expect(formatDeg(90.04)).toBe('90.0°');
    expect(formatRpm(6000)).toBe('6,000 rpm');
    expect(formatChangePct(-12.5)).toBe('−12.5%');
    expect(formatChangePct(3)).toBe('+3.0%');
  });
});
