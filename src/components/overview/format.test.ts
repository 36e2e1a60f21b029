import { describe, expect, it } from 'vitest';
import { formatMonth, formatPct, formatPer100, percentTicks } from './format';

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
  it('picks round percentage ticks just above the largest value', () => {
    expect(percentTicks(0)).toEqual([0, 5, 10]);
    expect(percentTicks(21.4)).toEqual([0, 5, 10, 15, 20, 25]);
    expect(percentTicks(25)).toEqual([0, 5, 10, 15, 20, 25, 30]);
    expect(percentTicks(45)).toEqual([0, 10, 20, 30, 40, 50]);
    expect(percentTicks(100)).toEqual([0, 20, 40, 60, 80, 100]);
  });
});
