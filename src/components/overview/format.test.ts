import { describe, expect, it } from 'vitest';
import { formatMonth, formatPct, formatPer100 } from './format';

describe('overview formatting', () => {
  it('shows shares as percentages with one decimal', () => {
    expect(formatPct(0.25)).toBe('25.0%');
    expect(formatPct(1 / 3)).toBe('33.3%');
    expect(formatPct(0)).toBe('0.0%');
    expect(formatPct(null)).toBe('–');
  });
  it('shows months short', () => {
    expect(formatMonth('2026-01')).toBe('Jan 26');
    expect(formatMonth('bad')).toBe('bad');
  });
  it('gives open defects per 100 vehicles', () => {
    expect(formatPer100(3, 40)).toBe('7.5');
    expect(formatPer100(3, 0)).toBe('–');
  });
});
