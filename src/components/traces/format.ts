/** Number formatting of trace figures (volts, hertz, percent, degrees, rpm, sample rates, durations). */

const n = (x: number, digits: number) => x.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits });

/** Volts with two decimals: "4.98 V". */
export function formatVolts(v: number): string {
  return `${n(v, 2)} V`;
}

/** A frequency with four significant digits: "200.0 Hz", "1.234 kHz"; 0 as "–" (no switching). */
export function formatHz(hz: number): string {
  if (!(hz > 0)) return '–';
  if (hz >= 1000) return `${n(hz / 1000, Math.max(0, 3 - Math.floor(Math.log10(hz / 1000))))} kHz`;
  return `${n(hz, Math.max(0, 3 - Math.floor(Math.log10(hz))))} Hz`;
}

/** A sample rate: "100 kS/s", "1 MS/s", "20.5 kS/s". */
export function formatSampleRate(hz: number): string {
  const fmt = (x: number) => Number(x.toPrecision(3)).toLocaleString('en-GB');
  if (hz >= 1e6) return `${fmt(hz / 1e6)} MS/s`;
  if (hz >= 1e3) return `${fmt(hz / 1e3)} kS/s`;
  return `${fmt(hz)} S/s`;
}

/** Percent with one decimal: "49.8%". */
export function formatPct(p: number): string {
  return Number.isFinite(p) ? `${n(p, 1)}%` : '–';
}

/** Degrees with one decimal: "90.2°". */
export function formatDeg(d: number): string {
  return `${n(d, 1)}°`;
}

/** A signed change in percent: "−12.5%", "+3.0%". */
export function formatChangePct(p: number): string {
  const sign = p > 0 ? '+' : p < 0 ? '−' : '';
  return `${sign}${n(Math.abs(p), 1)}%`;
}

/** Revolutions per minute: "6,000 rpm". */
export function formatRpm(rpm: number): string {
  return `${n(rpm, 0)} rpm`;
}

/** Bytes in words: "812 B", "4.2 KB", "48.0 MB". */
export function formatBytes(b: number): string {
  if (b < 1024) return `${b} B`;
  if (b < 1024 * 1024) return `${(b / 1024).toFixed(1)} KB`;
  return `${(b / 1024 / 1024).toFixed(1)} MB`;
}

/** A duration in words for the readout, three significant digits: "12.5 ms", "840 µs", "1.20 s", "0 ms". */
export function formatSpan(s: number): string {
  if (s === 0) return '0 ms';
  for (const [scale, unit] of [[1, 's'], [1e3, 'ms'], [1e6, 'µs']] as const) {
    const text = (s * scale).toPrecision(3);
    if (Math.abs(Number(text)) >= 1 && !text.includes('e')) return `${text} ${unit}`;
  }
  return `${(s * 1e9).toPrecision(3)} ns`;
}

/**
 * The bounds of a plot window, offsets from the start of the capture, in one unit and with enough decimals that
 * they differ by the span shown: "16.400 ms" and "16.520 ms" for 120 µs (not "16.4 ms" and "16.5 ms").
 */
export function formatWindowBounds(fromS: number, toS: number): { from: string; to: string } {
  const big = Math.max(Math.abs(fromS), Math.abs(toS));
  const [scale, unit] = big >= 1 ? [1, 's'] : big >= 1e-3 ? [1e3, 'ms'] : [1e6, 'µs'];
  // The span as the readout shows it (three significant digits, as formatSpan), so that 99.995 ms counts as 100 ms.
  const span = Number(((toS - fromS) * scale).toPrecision(3));
  const decimals = span > 0 ? Math.min(6, Math.max(0, Math.ceil(-Math.log10(span) - 1e-9) + 2)) : 0;
  const f = (x: number) => `${(x * scale).toFixed(decimals)} ${unit}`;
  return { from: f(fromS), to: f(toS) };
}
