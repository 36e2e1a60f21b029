import { describe, it, expect } from 'vitest';
import { CaptureError, MAX_CAPTURE_SAMPLES, parseCapture, parseChannelUnit, parseTimeUnit } from './capture-parse';
import { analyzeCapture } from './analyze';
import { captureToCsv, generateCapture, type CsvVariant } from './generate';

const enc = (s: string): Uint8Array => new TextEncoder().encode(s);
const parse = (s: string) => parseCapture(enc(s));
const arr = (x: Float64Array): number[] => Array.from(x);

/** The CaptureError thrown by parsing `s` (fails the test when none is thrown). */
function errorOf(s: string | Uint8Array): CaptureError {
  try {
    parseCapture(typeof s === 'string' ? enc(s) : s);
  } catch (e) {
    expect(e).toBeInstanceOf(CaptureError);
    return e as CaptureError;
  }
  throw new Error('expected a CaptureError');
}

describe('parseCapture: reader variants', () => {
  it('reads a plain comma file with a header in seconds and volts', () => {
    const r = parse('time (s),A (V),B (V)\n0,0.1,4.9\n0.001,4.9,0.1\n');
    expect(arr(r.time)).toEqual([0, 0.001]);
    expect(arr(r.a)).toEqual([0.1, 4.9]);
    expect(arr(r.b)).toEqual([4.9, 0.1]);
    expect(r).toMatchObject({ samples: 2, delimiter: ',', decimalComma: false, timeUnit: 's', headerLine: 1, firstDataLine: 2, lastDataLine: 3, preambleLines: 0 });
    expect(r.header).toEqual(['time (s)', 'A (V)', 'B (V)']);
    expect(r.channelUnits).toEqual({ a: 'V', b: 'V' });
  });

  it('skips preamble lines; the header is the last text line before the numbers (ms)', () => {
    const r = parse('Instrument,Scope 2000\nSample rate,1000\n\nRecord length;3\nTime (ms),CH1 (V),CH2 (V)\n0,0.2,5\n1.5,5,0.2\n3,0.2,5\n');
    expect(r.headerLine).toBe(5);
    expect(r.preambleLines).toBe(3);
    expect(r.firstDataLine).toBe(6);
    expect(r.timeUnit).toBe('ms');
    expect(arr(r.time)).toEqual([0, 0.0015, 0.003]);
  });

  it('reads Time[us] with channels in mV', () => {
    const r = parse('Time[us],CH1[mV],CH2[mV]\n0,150,4950\n2,4950,150\n');
    expect(r.timeUnit).toBe('us');
    expect(r.channelUnits).toEqual({ a: 'mV', b: 'mV' });
    expect(r.time[1]).toBeCloseTo(2e-6, 18);
    expect(r.a[0]).toBeCloseTo(0.15, 12);
    expect(r.b[0]).toBeCloseTo(4.95, 12);
  });

  it('reads µs written as U+00B5, as U+03BC and as a Latin-1 0xB5 byte', () => {
    for (const unit of ['\u00b5s', '\u03bcs']) {
      expect(parse(`time (${unit}),a,b\n0,1,2\n5,1,2\n`).timeUnit).toBe('us');
    }
    const latin1 = Uint8Array.from([...enc('time ('), 0xb5, ...enc('s),a,b\n0,1,2\n5,1,2\n')]);
    expect(parseCapture(latin1).timeUnit).toBe('us');
  });

  it('reads t_s, t_ms and a time column without a unit (seconds)', () => {
    expect(parse('t_s,a_V,b_V\n0,1,2\n1,1,2\n').timeUnit).toBe('s');
    expect(parse('t_ms,a_V,b_V\n0,1,2\n1,1,2\n').timeUnit).toBe('ms');
    const r = parse('Time,A,B\n0,1,2\n1,1,2\n');
    expect(r.timeUnit).toBe('s');
    expect(arr(r.time)).toEqual([0, 1]);
  });

  it('converts only the channel marked mV', () => {
    const r = parse('time (s),A (V),B (mV)\n0,4.9,4900\n1,0.1,100\n');
    expect(arr(r.a)).toEqual([4.9, 0.1]);
    expect(r.b[0]).toBeCloseTo(4.9, 12);
    expect(r.channelUnits).toEqual({ a: 'V', b: 'mV' });
  });

  it('reads semicolons with a decimal comma', () => {
    const r = parse('Zeit (ms);Kanal A (V);Kanal B (V)\n0,000;0,12;4,87\n0,010;4,9;0,1\n');
    expect(r.delimiter).toBe(';');
    expect(r.decimalComma).toBe(true);
    expect(r.time[1]).toBeCloseTo(1e-5, 15);
    expect(arr(r.a)).toEqual([0.12, 4.9]);
    expect(arr(r.b)).toEqual([4.87, 0.1]);
  });

  it('reads semicolons with decimal points', () => {
    const r = parse('time;a;b\n0.5;1.25;2.5\n1.5;1.25;2.5\n');
    expect(r.delimiter).toBe(';');
    expect(r.decimalComma).toBe(false);
    expect(arr(r.time)).toEqual([0.5, 1.5]);
  });

  it('reads tabs, with a decimal comma or a point', () => {
    const c = parse('time (s)\tA (V)\tB (V)\n0\t0,5\t4,5\n0,25\t4,5\t0,5\n');
    expect(c).toMatchObject({ delimiter: '\t', decimalComma: true });
    expect(arr(c.time)).toEqual([0, 0.25]);
    expect(arr(c.a)).toEqual([0.5, 4.5]);
    const p = parse('0\t0.5\t4.5\n0.25\t4.5\t0.5\n');
    expect(p.delimiter).toBe('\t');
    expect(arr(p.b)).toEqual([4.5, 0.5]);
  });

  it('reads CRLF line ends and a UTF-8 BOM', () => {
    const r = parse('\uFEFFtime (ms),A,B\r\n0,1,2\r\n1,3,4\r\n');
    expect(r.timeUnit).toBe('ms');
    expect(r.header).toEqual(['time (ms)', 'A', 'B']);
    expect(arr(r.b)).toEqual([2, 4]);
  });

  it('reads a header-less file as seconds and volts', () => {
    const r = parse('0,0.1,4.9\n1e-3,4.9,0.1\n');
    expect(r).toMatchObject({ header: null, headerLine: null, firstDataLine: 1, timeUnit: 's' });
    expect(arr(r.time)).toEqual([0, 0.001]);
  });

  it('accepts quoted values, extra columns, blank lines, spaces and no final line end', () => {
    const r = parse('"time (s)","A","B","C"\n"0","0.1","4.9","x"\n\n  0.5 , 4.9 , 0.1 ,7\n1,0.1,4.9');
    expect(arr(r.time)).toEqual([0, 0.5, 1]);
    expect(arr(r.a)).toEqual([0.1, 4.9, 0.1]);
    expect(arr(r.b)).toEqual([4.9, 0.1, 4.9]);
    expect(r.lastDataLine).toBe(5);
  });

  it('reads signs, exponents and bare decimal points', () => {
    const r = parse('-1.5e-3,+2E0,.5\n-1e-3,5.,-0.25\n0,1E+1,-.75\n');
    expect(arr(r.time)).toEqual([-0.0015, -0.001, 0]);
    expect(arr(r.a)).toEqual([2, 5, 10]);
    expect(arr(r.b)).toEqual([0.5, -0.25, -0.75]);
  });

  it('reads numbers with many digits to double precision', () => {
    const r = parse('0.123456789012345678,3.14159265358979,2.718281828459045\n1,1,1\n');
    expect(r.time[0]).toBeCloseTo(0.123456789012345678, 14);
    expect(r.a[0]).toBeCloseTo(Math.PI, 13);
    expect(r.b[0]).toBeCloseTo(Math.E, 13);
  });

  const variants: Array<[string, CsvVariant]> = [
    ['comma, seconds, paren header', {}],
    ['preamble + ms + bracket header', { preamble: ['Scope export', 'Channels,2'], timeUnit: 'ms', header: 'bracket' }],
    ['us + millivolts + underscore header', { timeUnit: 'us', millivolts: true, header: 'underscore' }],
    ['µs (micro sign)', { timeUnit: 'µs' }],
    ['semicolon + decimal comma', { delimiter: ';', decimalComma: true }],
    ['tab + decimal comma + mV', { delimiter: '\t', decimalComma: true, millivolts: true }],
    ['tab + points', { delimiter: '\t' }],
    ['CRLF + BOM', { crlf: true, bom: true }],
    ['no header', { header: 'none' }],
  ];
  for (const [name, variant] of variants) {
    it(`round-trips a generated capture written as ${name}, and analyses it the same`, () => {
      const g = generateCapture({ sampleRateHz: 50_000, samples: 5_000, freqHz: 250, phaseDeg: -90, noiseV: 0.04, seed: 21 });
      const r = parseCapture(enc(captureToCsv(g, variant)));
      expect(r.samples).toBe(g.time.length);
      const valueTol = variant.millivolts ? 0.5e-4 : 0.5e-4 + 1e-12;
      for (let i = 0; i < r.samples; i += 97) {
        expect(Math.abs(r.time[i]! - g.time[i]!)).toBeLessThan(1e-9);
        expect(Math.abs(r.a[i]! - g.a[i]!)).toBeLessThanOrEqual(valueTol);
        expect(Math.abs(r.b[i]! - g.b[i]!)).toBeLessThanOrEqual(valueTol);
      }
      const x = analyzeCapture(r);
      expect(x.verdict).toBe('healthy');
      expect(x.direction).toBe('b_leads');
      expect(Math.abs(x.channels.a.freqHz / 250 - 1)).toBeLessThan(0.003);
    });
  }
});

describe('parseCapture: clear errors', () => {
  it('no numeric rows (empty file, text only): line null', () => {
    for (const s of ['', '\n\n', 'Model,X\nTime,A,B\n']) {
      const e = errorOf(s);
      expect(e.line).toBeNull();
      expect(e.message).toMatch(/no rows of numbers/);
    }
  });

  it('one column of numbers names its line', () => {
    const e = errorOf('time\n0.1\n0.2\n');
    expect(e.line).toBe(2);
    expect(e.message).toMatch(/^line 2: only one column/);
  });

  it('only one channel (time and one value) names the first data line', () => {
    for (const s of ['time (s),A (V)\n0,0.1\n1,4.9\n', 'time,A,B\n0,0.1,\n1,4.9,\n']) {
      const e = errorOf(s);
      expect(e.line).toBe(2);
      expect(e.message).toMatch(/only one channel/);
    }
  });

  it('a later row with only one channel names that row', () => {
    const e = errorOf('time,A,B\n0,1,2\n1,1,2\n2,1\n');
    expect(e.line).toBe(4);
    expect(e.message).toMatch(/only one channel: the row ends after channel A/);
  });

  it('time not increasing names the line and both times (also for equal times)', () => {
    const e = errorOf('time (ms),A,B\n0,1,2\n1,1,2\n0.5,1,2\n');
    expect(e.line).toBe(4);
    expect(e.message).toMatch(/^line 4: time does not increase: 0\.5 ms follows 1 ms/);
    expect(errorOf('0,1,2\n1,1,2\n1,1,2\n').line).toBe(3);
  });

  it('a value that is not a number names the line, the column and quotes the row', () => {
    const e = errorOf('time,A,B\n0,1,2\n1,1,abc\n');
    expect(e.line).toBe(3);
    expect(e.message).toBe('line 3: channel B (column 3) is not a number ("1,1,abc")');
    expect(errorOf('time,A,B\n0,1,2\n1,x,2\n').message).toMatch(/channel A \(column 2\) is not a number/);
    expect(errorOf('time,A,B\n0,1,2\nend of data\n').message).toMatch(/^line 3: time \(column 1\) is not a number/);
    expect(errorOf('0,1,2\n1,1,2x\n').message).toMatch(/^line 2: unexpected text after channel B/);
    expect(errorOf('0,1,2\n1,1,2e\n').message).toMatch(/^line 2: channel B \(column 3\) is not a number/);
  });

  it('is a named Error class with the line', () => {
    const e = errorOf('0,1,2\n0,1,2\n');
    expect(e).toBeInstanceOf(Error);
    expect(e.name).toBe('CaptureError');
    expect(e.line).toBe(2);
  });

  /** `rows` rows "i,0,0" (i = 0, 1, ...) after a header line, as bytes. */
  function bigCapture(rows: number): Uint8Array {
    const header = enc('t_us,a,b\n');
    const out = new Uint8Array(header.length + rows * 13);
    out.set(header);
    let p = header.length;
    for (let i = 0; i < rows; i++) {
      const s = String(i);
      for (let k = 0; k < s.length; k++) out[p++] = s.charCodeAt(k);
      out[p++] = 44;
      out[p++] = 48;
      out[p++] = 44;
      out[p++] = 49;
      out[p++] = 10;
    }
    return out.subarray(0, p);
  }

  it(`accepts exactly ${MAX_CAPTURE_SAMPLES} samples and rejects one more, naming its line`, () => {
    const ok = parseCapture(bigCapture(MAX_CAPTURE_SAMPLES));
    expect(ok.samples).toBe(MAX_CAPTURE_SAMPLES);
    expect(ok.time[MAX_CAPTURE_SAMPLES - 1]).toBeCloseTo((MAX_CAPTURE_SAMPLES - 1) * 1e-6, 9);
    const e = errorOf(bigCapture(MAX_CAPTURE_SAMPLES + 1));
    expect(e.line).toBe(MAX_CAPTURE_SAMPLES + 2);
    expect(e.message).toMatch(/more than 2,000,000 samples/);
  });

  it('too short to hold two periods is reported by the analysis (CaptureError, line null)', () => {
    const r = parse('time (ms),A,B\n0,0,0\n1,5,0\n2,5,5\n3,0,5\n4,0,0\n5,5,0\n');
    expect(() => analyzeCapture(r)).toThrow(/too short/);
  });
});

describe('unit names', () => {
  it('parseTimeUnit', () => {
    expect(parseTimeUnit('time (ms)')).toBe('ms');
    expect(parseTimeUnit('Time[us]')).toBe('us');
    expect(parseTimeUnit('TIME [µs]')).toBe('us');
    expect(parseTimeUnit('t_s')).toBe('s');
    expect(parseTimeUnit('Seconds')).toBe('s');
    expect(parseTimeUnit('time/ms')).toBe('ms');
    expect(parseTimeUnit('timestamp')).toBe('s');
  });
  it('parseChannelUnit', () => {
    expect(parseChannelUnit('CH1 (mV)')).toBe('mV');
    expect(parseChannelUnit('a_mV')).toBe('mV');
    expect(parseChannelUnit('CH2[V]')).toBe('V');
    expect(parseChannelUnit('B')).toBe('V');
  });
});
