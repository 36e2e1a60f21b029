import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { runTraceCommand } from './trace';
import { captureToCsv, generateCapture } from '@/lib/traces/generate';

let dir = '';
const file = (name: string): string => path.join(dir, name);

/** Run the command with captured output. */
async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const code = await runTraceCommand(argv, { stdout: { write: (s: string) => (out += s) }, stderr: { write: (s: string) => (err += s) } });
  return { code, out, err };
}

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'seepline-trace-cli-'));
  const healthy = generateCapture({ sampleRateHz: 50_000, samples: 10_000, freqHz: 200, noiseV: 0.03, seed: 2 });
  writeFileSync(file('healthy.csv'), captureToCsv(healthy, { delimiter: ';', decimalComma: true, timeUnit: 'ms' }));
  writeFileSync(file('backwards.csv'), 'time (s),A,B\n0,0,0\n0.001,5,0\n0.0005,5,5\n');
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('trace command', () => {
  it('prints the analysis JSON with --json and exits 0', async () => {
    const r = await run([file('healthy.csv'), '--pulses-per-rev', '2', '--json']);
    expect(r.code).toBe(0);
    expect(r.err).toBe('');
    const j = JSON.parse(r.out);
    expect(j.verdict).toBe('healthy');
    expect(j.direction).toBe('a_leads');
    expect(j.samples).toBe(10_000);
    expect(Math.abs(j.rpm / 6000 - 1)).toBeLessThan(0.003);
    expect(j.channels.a).toHaveProperty('dutyPct');
  });

  it('prints a short summary without --json and takes --supply-v', async () => {
    const r = await run([file('healthy.csv'), '--supply-v', '12']);
    expect(r.code).toBe(0);
    expect(r.out.split('\n')[0]).toBe(`${file('healthy.csv')}: low_amplitude`);
  });

  it('exits 1 with one line on stderr for a capture it cannot use, naming the line', async () => {
    const r = await run([file('backwards.csv'), '--json']);
    expect(r.code).toBe(1);
    expect(r.out).toBe('');
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).toMatch(/line 4: time does not increase/);
  });

  it('exits 1 for a missing file', async () => {
    const r = await run([file('nope.csv')]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/cannot read .*nope\.csv: no such file/);
  });

  it('exits 2 on bad usage', async () => {
    expect((await run([])).code).toBe(2);
    expect((await run(['a.csv', 'b.csv'])).code).toBe(2);
    expect((await run([file('healthy.csv'), '--pulses-per-rev', 'zero'])).code).toBe(2);
    expect((await run([file('healthy.csv'), '--supply-v', '-5'])).code).toBe(2);
    const unknown = await run([file('healthy.csv'), '--frobnicate']);
    expect(unknown.code).toBe(2);
    expect(unknown.err).toMatch(/Usage: trace FILE/);
  });
});
