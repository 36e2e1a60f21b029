/**
 * Capture reader (CONTRACT.md "Traces"): a two-channel oscilloscope capture saved as text, one sample per
 * line (time, channel A, channel B), parsed straight from bytes into typed arrays.
 *
 * Accepted:
 * - UTF-8 with or without BOM (UTF-16 with a BOM is converted first); LF or CRLF line ends; blank lines
 *   anywhere are skipped.
 * - Preamble lines (anything that is not a row of numbers) before the header row. The header is the last
 *   non-numeric line before the first numeric row; a file may also have no header (seconds and volts then).
 * - Header units: the time column's name carries `s`, `ms`, `us` or `µs` (e.g. `time (ms)`, `Time[us]`,
 *   `t_s`; seconds when none); a channel column carrying `mV` is in millivolts (volts otherwise).
 * - Delimiter comma, semicolon or tab, chosen from the first numeric row (tab, else semicolon, else comma).
 *   With semicolon or tab a decimal comma is allowed (`0,0015;4,98;0,12`). Values may be quoted.
 * - Columns beyond the third are ignored. Up to MAX_CAPTURE_SAMPLES samples.
 *
 * Errors are thrown as CaptureError with the 1-based line number where there is one: no numeric rows,
 * only one channel, a value that is not a number, time not increasing, too many samples. "Too short to hold
 * two periods" is detected by the analysis (analyze.ts), which throws the same class with `line: null`.
 *
 * NOTE: the data rows are parsed by a hand-written byte loop (no per-line strings, no split, no
 * parseFloat) because a full-size capture is about 48 MB; keep it allocation-free when editing.
 */

/** Most samples a capture may hold (CONTRACT.md "Traces"). */
export const MAX_CAPTURE_SAMPLES = 2_000_000;

/** Time unit named in the header's time column. */
export type CaptureTimeUnit = 's' | 'ms' | 'us';

/** Column delimiter of a capture. */
export type CaptureDelimiter = ',' | ';' | '\t';

/** Unit of a channel column. */
export type ChannelUnit = 'V' | 'mV';

/** The three sample arrays every analysis works on: time in seconds, channels in volts. */
export interface CaptureData {
  /** Sample instants, seconds, strictly increasing. */
  time: Float64Array;
  /** Channel A, volts. */
  a: Float64Array;
  /** Channel B, volts. */
  b: Float64Array;
}

/** A parsed capture: the sample arrays plus what the reader found out about the file. */
export interface CaptureParseResult extends CaptureData {
  /** Number of samples (length of each array). */
  samples: number;
  delimiter: CaptureDelimiter;
  /** True when the first data row used a decimal comma. */
  decimalComma: boolean;
  /** Unit of the time column in the file (the arrays are converted to seconds). */
  timeUnit: CaptureTimeUnit;
  /** Units of the channel columns in the file (the arrays are converted to volts). */
  channelUnits: { a: ChannelUnit; b: ChannelUnit };
  /** Header cells as written (trimmed), or null for a header-less file. */
  header: string[] | null;
  /** 1-based line of the header row, or null. */
  headerLine: number | null;
  /** Lines before the header row (preamble), excluding blank lines. */
  preambleLines: number;
  /** 1-based lines of the first and last data rows. */
  firstDataLine: number;
  lastDataLine: number;
}

/** A capture the reader or the analysis cannot use; `line` is 1-based, or null when no line is to blame. */
export class CaptureError extends Error {
  readonly line: number | null;

  constructor(message: string, line: number | null = null) {
    super(line === null ? message : `line ${line}: ${message}`);
    this.name = 'CaptureError';
    this.line = line;
  }
}

const LF = 10;
const CR = 13;
const TAB = 9;
const SPACE = 32;
const QUOTE = 34;
const COMMA = 44;
const SEMICOLON = 59;
const DOT = 46;
const MINUS = 45;
const PLUS = 43;
const DIGIT_0 = 48;
const DIGIT_9 = 57;
const LOWER_E = 101;
const UPPER_E = 69;

/** Bytes of rows handed to the row loop per call (the first call small, so it completes unoptimised and V8 sees every path, the end of the loop included, before optimising). */
const ROW_CHUNK_BYTES = 4 * 1024 * 1024;
const FIRST_ROW_CHUNK_BYTES = 16 * 1024;
/** Digits stop being added once the mantissa reaches this: at most 15 significant digits, below 2^53, exact. */
const MANTISSA_LIMIT = 1e14;
const POW10: Float64Array = (() => {
  const p = new Float64Array(23);
  p[0] = 1;
  for (let i = 1; i < 23; i++) p[i] = p[i - 1]! * 10;
  return p;
})();

const TIME_UNIT_SCALE: Readonly<Record<CaptureTimeUnit, number>> = { s: 1, ms: 1e-3, us: 1e-6 };

/** Position just after the last number read by readNumber (module-level to keep the hot loop allocation-free). */
let cursor = 0;

/**
 * Read a decimal number at `p` (optional sign, digits, '.' or — when `decimalComma` — ',' as the decimal
 * mark, optional exponent; same grammar as the row loop in parseRows). Sets `cursor` to the first byte after it; returns NaN when no digits are there.
 */
function readNumber(bytes: Uint8Array, p: number, n: number, decimalComma: boolean): number {
  let c = p < n ? bytes[p]! : 0;
  let negative = false;
  if (c === MINUS) {
    negative = true;
    c = ++p < n ? bytes[p]! : 0;
  } else if (c === PLUS) {
    c = ++p < n ? bytes[p]! : 0;
  }
  let mantissa = 0;
  let exponent = 0;
  let digits = 0;
  while (c >= DIGIT_0 && c <= DIGIT_9) {
    if (mantissa < MANTISSA_LIMIT) mantissa = mantissa * 10 + (c - DIGIT_0);
    else exponent++;
    digits++;
    c = ++p < n ? bytes[p]! : 0;
  }
  if (c === DOT || (decimalComma && c === COMMA)) {
    c = ++p < n ? bytes[p]! : 0;
    while (c >= DIGIT_0 && c <= DIGIT_9) {
      if (mantissa < MANTISSA_LIMIT) {
        mantissa = mantissa * 10 + (c - DIGIT_0);
        exponent--;
      }
      digits++;
      c = ++p < n ? bytes[p]! : 0;
    }
  }
  if (digits === 0) {
    cursor = p;
    return NaN;
  }
  if (c === LOWER_E || c === UPPER_E) {
    let q = p + 1;
    let e = q < n ? bytes[q]! : 0;
    let expNegative = false;
    if (e === MINUS) {
      expNegative = true;
      e = ++q < n ? bytes[q]! : 0;
    } else if (e === PLUS) {
      e = ++q < n ? bytes[q]! : 0;
    }
    let expValue = 0;
    let expDigits = 0;
    while (e >= DIGIT_0 && e <= DIGIT_9) {
      if (expValue < 10000) expValue = expValue * 10 + (e - DIGIT_0);
      expDigits++;
      e = ++q < n ? bytes[q]! : 0;
    }
    if (expDigits === 0) {
      cursor = q;
      return NaN;
    }
    exponent += expNegative ? -expValue : expValue;
    p = q;
  }
  cursor = p;
  let value: number;
  if (exponent === 0) value = mantissa;
  else if (exponent > 0) value = exponent <= 22 ? mantissa * POW10[exponent]! : mantissa * Math.pow(10, exponent);
  else value = exponent >= -22 ? mantissa / POW10[-exponent]! : mantissa / Math.pow(10, -exponent);
  return negative ? -value : value;
}

/** Skip spaces, CR and quotes (and tabs unless tab is the delimiter) from `p`; returns the new position. */
function skipBlanks(bytes: Uint8Array, p: number, n: number, tabIsDelimiter: boolean): number {
  while (p < n) {
    const c = bytes[p]!;
    if (c === SPACE || c === CR || c === QUOTE || (c === TAB && !tabIsDelimiter)) p++;
    else break;
  }
  return p;
}

/** Index of the next LF at or after `p`, or `n`. */
function lineEnd(bytes: Uint8Array, p: number, n: number): number {
  const i = bytes.indexOf(LF, p);
  return i < 0 ? n : i;
}

/** Delimiter of one line: tab if it has one, else semicolon, else comma. */
function lineDelimiter(bytes: Uint8Array, start: number, end: number): number {
  let semicolon = false;
  let comma = false;
  for (let i = start; i < end; i++) {
    const c = bytes[i]!;
    if (c === TAB) return TAB;
    if (c === SEMICOLON) semicolon = true;
    else if (c === COMMA) comma = true;
  }
  return semicolon ? SEMICOLON : comma ? COMMA : COMMA;
}

const decoder = new TextDecoder('utf-8');

/** The text of bytes [start, end) for messages, trimmed and shortened. */
function snippet(bytes: Uint8Array, start: number, end: number): string {
  const text = decoder.decode(bytes.subarray(start, Math.min(end, start + 200))).replace(/\r/g, '').trim();
  return text.length > 60 ? `${text.slice(0, 57)}...` : text;
}

/** Split a header line into trimmed cells; µ (U+00B5, U+03BC, or a lone Latin-1 0xB5 byte) becomes "u". */
function headerCells(bytes: Uint8Array, start: number, end: number, delimiter: number): string[] {
  let text = '';
  for (let i = start; i < end; i++) {
    const c = bytes[i]!;
    if (c < 0x80) {
      text += String.fromCharCode(c);
    } else if ((c === 0xc2 && bytes[i + 1] === 0xb5) || (c === 0xce && bytes[i + 1] === 0xbc)) {
      text += 'u';
      i++;
    } else if (c === 0xb5) {
      text += 'u';
    } else if (c >= 0xc0) {
      text += '?'; // first byte of some other multi-byte character
    }
  }
  const d = String.fromCharCode(delimiter);
  return text
    .replace(/^\uFEFF/, '')
    .split(d)
    .map((cell) => cell.replace(/["\r]/g, '').trim());
}

/** Lower-case alphanumeric tokens of a header cell: "Time [us]" -> ["time", "us"]. */
function tokens(cell: string): string[] {
  return cell.toLowerCase().split(/[^a-z0-9]+/).filter((t) => t.length > 0);
}

/** Time unit named in a time column header (`s`, `ms`, `us`; seconds when none is named). */
export function parseTimeUnit(cell: string): CaptureTimeUnit {
  for (const t of tokens(cell.replace(/[\u00b5\u03bc]/g, 'u'))) {
    if (t === 's' || t === 'sec' || t === 'secs' || t === 'second' || t === 'seconds') return 's';
    if (t === 'ms' || t === 'msec' || t === 'millisecond' || t === 'milliseconds') return 'ms';
    if (t === 'us' || t === 'usec' || t === 'microsecond' || t === 'microseconds') return 'us';
  }
  return 's';
}

/** Unit of a channel column header: `mV` when it names millivolts, volts otherwise. */
export function parseChannelUnit(cell: string): ChannelUnit {
  for (const t of tokens(cell)) {
    if (t === 'mv' || t === 'millivolt' || t === 'millivolts') return 'mV';
  }
  return 'V';
}

/** Outcome of looking at one line before the data: how many leading fields are numbers, and fields in all. */
interface LineShape {
  numericFields: number;
  /** True when a third field exists after two numbers (it may be empty or not a number). */
  hasThirdField: boolean;
  thirdFieldEmpty: boolean;
}

/** Count the leading numeric fields (up to 3) of a line with the given delimiter. */
function lineShape(bytes: Uint8Array, start: number, end: number, delimiter: number): LineShape {
  const decimalComma = delimiter !== COMMA;
  const tab = delimiter === TAB;
  const shape: LineShape = { numericFields: 0, hasThirdField: false, thirdFieldEmpty: false };
  let p = start;
  for (let field = 0; field < 3; field++) {
    p = skipBlanks(bytes, p, end, tab);
    const value = readNumber(bytes, p, end, decimalComma);
    if (Number.isNaN(value)) break;
    const q = skipBlanks(bytes, cursor, end, tab);
    if (q < end && bytes[q] !== delimiter) break; // text glued to the number: not a numeric field
    shape.numericFields++;
    if (q >= end) break; // the line ends here
    p = q + 1; // past the delimiter
    if (shape.numericFields === 2) {
      shape.hasThirdField = true;
      const r = skipBlanks(bytes, p, end, tab);
      shape.thirdFieldEmpty = r >= end || bytes[r] === delimiter;
    }
  }
  return shape;
}

/**
 * Parse a capture file's bytes into time (s) and channel (V) arrays.
 * @throws CaptureError when the file holds nothing the analysis can use (see the module comment).
 */
export function parseCapture(bytes: Uint8Array): CaptureParseResult {
  // Spreadsheets also save "Unicode text" (UTF-16 with a byte-order mark): convert it to UTF-8 first.
  if (bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff))) {
    const text = new TextDecoder(bytes[0] === 0xff ? 'utf-16le' : 'utf-16be').decode(bytes);
    return parseCapture(new TextEncoder().encode(text));
  }
  const n = bytes.length;
  let p = n >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  let lineNo = 0;

  // Phase 1: find the first row of numbers; the last non-blank line before it is the header.
  let headerStart = -1;
  let headerEnd = -1;
  let headerLineNo = 0;
  let nonBlankBefore = 0;
  let singleNumberLine = 0;
  let dataStart = -1;
  let delimiter = COMMA;
  let firstShape: LineShape | null = null;
  while (p < n) {
    lineNo++;
    const start = p;
    const end = lineEnd(bytes, p, n);
    p = end + 1;
    const first = skipBlanks(bytes, start, end, false);
    if (first >= end) continue;
    const d = lineDelimiter(bytes, start, end);
    const shape = lineShape(bytes, start, end, d);
    if (shape.numericFields >= 2) {
      dataStart = start;
      delimiter = d;
      firstShape = shape;
      break;
    }
    if (shape.numericFields === 1 && singleNumberLine === 0) {
      const after = skipBlanks(bytes, cursor, end, d === TAB);
      if (after >= end) singleNumberLine = lineNo;
    }
    nonBlankBefore++;
    headerStart = start;
    headerEnd = end;
    headerLineNo = lineNo;
  }
  if (dataStart < 0 || firstShape === null) {
    if (singleNumberLine > 0) {
      throw new CaptureError(
        'only one column of numbers found; a capture needs three columns: time, channel A, channel B',
        singleNumberLine,
      );
    }
    throw new CaptureError(
      'no rows of numbers found; a capture needs lines of time, channel A, channel B (e.g. "0.000125,4.98,0.12")',
    );
  }
  const firstDataLine = lineNo;
  if (firstShape.numericFields === 2 && (!firstShape.hasThirdField || firstShape.thirdFieldEmpty)) {
    throw new CaptureError(
      'only one channel: this row has a time and one value; the analysis needs both hall-sensor channels (time, A, B)',
      firstDataLine,
    );
  }

  // Units from the header, if there is one.
  let header: string[] | null = null;
  let timeUnit: CaptureTimeUnit = 's';
  let unitA: ChannelUnit = 'V';
  let unitB: ChannelUnit = 'V';
  if (headerStart >= 0) {
    header = headerCells(bytes, headerStart, headerEnd, delimiter);
    timeUnit = parseTimeUnit(header[0] ?? '');
    unitA = parseChannelUnit(header[1] ?? '');
    unitB = parseChannelUnit(header[2] ?? '');
  }
  const timeScale = TIME_UNIT_SCALE[timeUnit];
  const scaleA = unitA === 'mV' ? 1e-3 : 1;
  const scaleB = unitB === 'mV' ? 1e-3 : 1;

  // Phase 2: the data rows. Every row needs at least 5 bytes plus a line end, which bounds the row count.
  const capacity = Math.min(MAX_CAPTURE_SAMPLES, Math.floor((n - dataStart + 1) / 6) + 1);
  const out: RowOutput = {
    time: new Float64Array(capacity),
    a: new Float64Array(capacity),
    b: new Float64Array(capacity),
  };
  const pos = Float64Array.of(0, -Infinity, firstDataLine - 1, firstDataLine);
  const firstEnd = lineEnd(bytes, dataStart, n);
  const sawDecimalComma = delimiter !== COMMA && containsComma(bytes, dataStart, firstEnd);
  const units: RowUnits = { delimiter, timeScale, scaleA, scaleB, timeUnit };
  // The row loop reads without bounds checks, relying on every line ending in LF: run it up to the last
  // LF, then on a copy of any unterminated last line with an LF appended.
  // NOTE: it runs on line-aligned chunks (a small first one, then ROW_CHUNK_BYTES). A single call over
  // 48 MB spends its whole life in on-stack-replaced code compiled before the end of the loop had ever run,
  // and such code deoptimised at the end of every later call; chunked, V8 compiles it normally.
  const lastLf = bytes.lastIndexOf(LF);
  for (let from = dataStart, chunk = FIRST_ROW_CHUNK_BYTES; from <= lastLf; chunk = ROW_CHUNK_BYTES) {
    const to = from + chunk >= lastLf ? lastLf + 1 : bytes.indexOf(LF, from + chunk) + 1;
    parseRows(bytes, from, to, units, out.time, out.a, out.b, pos);
    from = to;
  }
  const tailStart = Math.max(dataStart, lastLf + 1);
  if (tailStart < n) {
    const tail = new Uint8Array(n - tailStart + 1);
    tail.set(bytes.subarray(tailStart, n));
    tail[tail.length - 1] = LF;
    parseRows(tail, 0, tail.length, units, out.time, out.a, out.b, pos);
  }
  const { time, a, b } = out;
  const count = pos[POS_COUNT]!;
  const lastDataLine = pos[POS_LAST_DATA_LINE]!;

  const fit = (x: Float64Array): Float64Array =>
    count === x.length ? x : count * 2 < x.length ? x.slice(0, count) : x.subarray(0, count);
  return {
    time: fit(time),
    a: fit(a),
    b: fit(b),
    samples: count,
    delimiter: delimiter === TAB ? '\t' : delimiter === SEMICOLON ? ';' : ',',
    decimalComma: sawDecimalComma,
    timeUnit,
    channelUnits: { a: unitA, b: unitB },
    header,
    headerLine: headerStart >= 0 ? headerLineNo : null,
    preambleLines: headerStart >= 0 ? nonBlankBefore - 1 : 0,
    firstDataLine,
    lastDataLine,
  };
}

/** Output arrays of the row loop. */
interface RowOutput {
  time: Float64Array;
  a: Float64Array;
  b: Float64Array;
}

/** Indices into the row loop's position array (a Float64Array, so the loop does no named property writes). */
const POS_COUNT = 0;
const POS_PREVIOUS_TIME = 1;
const POS_LINE = 2;
const POS_LAST_DATA_LINE = 3;

/** Fixed facts about the data rows. */
interface RowUnits {
  delimiter: number;
  timeScale: number;
  scaleA: number;
  scaleB: number;
  timeUnit: CaptureTimeUnit;
}

/**
 * Parse data rows in bytes [from, end), where bytes[end - 1] is LF and every line ends in LF, so the loop
 * never reads past `end` without checking. Numbers are parsed inline (same grammar as readNumber).
 * NOTE: the position lives in a Float64Array and the loop makes no named property writes: a property
 * write after the loop, reached first in optimised (on-stack-replaced) code, made V8 deoptimise on
 * every chunk.
 */
function parseRows(
  bytes: Uint8Array,
  from: number,
  end: number,
  units: RowUnits,
  time: Float64Array,
  a: Float64Array,
  b: Float64Array,
  pos: Float64Array,
): void {
  const delimiter = units.delimiter;
  const timeScale = units.timeScale;
  const scaleA = units.scaleA;
  const scaleB = units.scaleB;
  const decimalComma = delimiter !== COMMA;
  const tab = delimiter === TAB;
  const capacity = time.length;
  let count = pos[POS_COUNT]!;
  let previousTime = pos[POS_PREVIOUS_TIME]!;
  let lineNo = pos[POS_LINE]!;
  let lastDataLine = pos[POS_LAST_DATA_LINE]!;
  let p = from;
  let t = 0;
  let va = 0;
  let vb = 0;
  while (p < end) {
    lineNo++;
    const start = p;
    let c = bytes[p]!;
    while (c <= QUOTE && (c === SPACE || c === CR || c === QUOTE || (c === TAB && !tab))) c = bytes[++p]!;
    if (c === LF) {
      p++;
      continue;
    }
    for (let field = 0; field < 3; field++) {
      let negative = false;
      if (c === MINUS) {
        negative = true;
        c = bytes[++p]!;
      } else if (c === PLUS) {
        c = bytes[++p]!;
      }
      // Digits beyond MANTISSA_LIMIT are dropped (integer part: counted in the exponent).
      let mantissa = 0;
      let exponent = 0;
      const numberStart = p;
      while (c >= DIGIT_0 && c <= DIGIT_9) {
        if (mantissa < MANTISSA_LIMIT) mantissa = mantissa * 10 + (c - DIGIT_0);
        else exponent++;
        c = bytes[++p]!;
      }
      let digits = p - numberStart;
      if (c === DOT || (decimalComma && c === COMMA)) {
        c = bytes[++p]!;
        const fractionStart = p;
        while (c >= DIGIT_0 && c <= DIGIT_9) {
          if (mantissa < MANTISSA_LIMIT) {
            mantissa = mantissa * 10 + (c - DIGIT_0);
            exponent--;
          }
          c = bytes[++p]!;
        }
        digits += p - fractionStart;
      }
      if (c === LOWER_E || c === UPPER_E) {
        c = bytes[++p]!;
        let expNegative = false;
        if (c === MINUS) {
          expNegative = true;
          c = bytes[++p]!;
        } else if (c === PLUS) {
          c = bytes[++p]!;
        }
        let expValue = 0;
        let expDigits = 0;
        while (c >= DIGIT_0 && c <= DIGIT_9) {
          if (expValue < 10000) expValue = expValue * 10 + (c - DIGIT_0);
          expDigits++;
          c = bytes[++p]!;
        }
        if (expDigits === 0) digits = 0;
        exponent += expNegative ? -expValue : expValue;
      }
      if (digits === 0) throw rowError(bytes, start, end, lineNo, `${FIELD_NAMES[field]} is not a number`);
      let value: number;
      if (exponent === 0) value = mantissa;
      else if (exponent > 0) value = exponent <= 22 ? mantissa * POW10[exponent]! : mantissa * Math.pow(10, exponent);
      else value = exponent >= -22 ? mantissa / POW10[-exponent]! : mantissa / Math.pow(10, -exponent);
      if (negative) value = -value;
      while (c <= QUOTE && (c === SPACE || c === CR || c === QUOTE || (c === TAB && !tab))) c = bytes[++p]!;
      if (field === 0) t = value;
      else if (field === 1) va = value;
      else vb = value;
      if (field < 2) {
        if (c !== delimiter) throw rowError(bytes, start, end, lineNo, missing(bytes, p, end, field + 2));
        c = bytes[++p]!;
        while (c <= QUOTE && (c === SPACE || c === CR || c === QUOTE || (c === TAB && !tab))) c = bytes[++p]!;
      }
    }
    if (c === LF) p++;
    else if (c === delimiter) p = bytes.indexOf(LF, p) + 1;
    else throw rowError(bytes, start, end, lineNo, 'unexpected text after channel B');
    if (!(t > previousTime)) {
      throw new CaptureError(
        `time does not increase: ${formatNumber(t)} ${units.timeUnit} follows ${formatNumber(previousTime)} ${units.timeUnit} on the previous row; every row must be later than the one before`,
        lineNo,
      );
    }
    if (count >= capacity) {
      // The capacity bound makes this reachable only at the sample limit.
      throw new CaptureError(
        `more than ${MAX_CAPTURE_SAMPLES.toLocaleString('en-US')} samples; save a shorter capture or a lower sample rate`,
        lineNo,
      );
    }
    previousTime = t;
    time[count] = t * timeScale;
    a[count] = va * scaleA;
    b[count] = vb * scaleB;
    count++;
    lastDataLine = lineNo;
  }
  pos[POS_COUNT] = count;
  pos[POS_PREVIOUS_TIME] = previousTime;
  pos[POS_LINE] = lineNo;
  pos[POS_LAST_DATA_LINE] = lastDataLine;
}

const FIELD_NAMES = ['time (column 1)', 'channel A (column 2)', 'channel B (column 3)'] as const;

/** True when bytes [from, to) contain a comma. */
function containsComma(bytes: Uint8Array, from: number, to: number): boolean {
  for (let i = from; i < to; i++) if (bytes[i] === COMMA) return true;
  return false;
}

/** Message for a row that ends (or has something else) where a delimiter and column `column` should be. */
function missing(bytes: Uint8Array, p: number, n: number, column: number): string {
  const name = column === 2 ? 'channel A (column 2)' : 'channel B (column 3)';
  if (p >= n || bytes[p] === LF) {
    return column === 3
      ? 'only one channel: the row ends after channel A; the analysis needs both hall-sensor channels (time, A, B)'
      : `the row ends before ${name}`;
  }
  return `expected the delimiter before ${name}, found other text`;
}

/** A CaptureError for a data row, quoting the row. */
function rowError(bytes: Uint8Array, start: number, n: number, line: number, what: string): CaptureError {
  return new CaptureError(`${what} ("${snippet(bytes, start, lineEnd(bytes, start, n))}")`, line);
}

/** Short number for messages. */
function formatNumber(x: number): string {
  return Number.isFinite(x) ? String(Number(x.toPrecision(10))) : String(x);
}
