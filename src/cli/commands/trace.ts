/**
 * `trace FILE [--pulses-per-rev N] [--supply-v V] [--json]` (CONTRACT.md "Command line"): analyses a
 * hall-sensor capture without storing it and prints the same JSON as `POST /api/traces` (without `id`),
 * or a short summary without --json. Exit 0 on success, 1 with one line on stderr for a capture that cannot
 * be used or read, 2 on bad usage. Kept free of database and framework imports so it starts fast; edit
 * when the command's options change.
 */
import { parseArgs } from 'node:util';
import { CaptureError } from '@/lib/traces/capture-parse';
import type { TraceAnalysis } from '@/lib/traces/analyze';
import { analyzeCaptureFile } from '@/server/traces/analyze-file';

/** Usage line of the trace command. */
export const TRACE_USAGE = 'Usage: trace FILE [--pulses-per-rev N] [--supply-v V] [--json]';

/** Where the command writes (injectable for tests). */
export interface TraceIo {
  stdout: { write(s: string): unknown };
  stderr: { write(s: string): unknown };
}

/** Run the trace command on its arguments (after the word `trace`); resolves to the exit status. */
export async function runTraceCommand(argv: string[], io: TraceIo = process): Promise<number> {
  let values: { 'pulses-per-rev'?: string; 'supply-v'?: string; json?: boolean; help?: boolean };
  let positionals: string[];
  try {
    ({ values, positionals } = parseArgs({
      args: argv,
      options: {
        'pulses-per-rev': { type: 'string' },
        'supply-v': { type: 'string' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
      },
      allowPositionals: true,
      strict: true,
    }));
  } catch (e) {
    return usage(io, (e as Error).message);
  }
  if (values.help) {
    io.stdout.write(`${TRACE_USAGE}\n`);
    return 0;
  }
  if (positionals.length !== 1) return usage(io, `expected one FILE, got ${positionals.length}`);
  const file = positionals[0]!;
  const pulsesPerRev = positive(values['pulses-per-rev']);
  if (pulsesPerRev === null) return usage(io, '--pulses-per-rev must be a positive number');
  const supplyV = positive(values['supply-v']);
  if (supplyV === null) return usage(io, '--supply-v must be a positive number of volts');

  let analysis: TraceAnalysis;
  try {
    analysis = await analyzeCaptureFile(file, {
      ...(pulsesPerRev !== undefined ? { pulsesPerRev } : {}),
      ...(supplyV !== undefined ? { supplyV } : {}),
    });
  } catch (e) {
    if (e instanceof CaptureError) {
      io.stderr.write(`error: ${file}: ${e.message}\n`);
      return 1;
    }
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT' || code === 'EACCES' || code === 'EISDIR') {
      io.stderr.write(`error: cannot read ${file}: ${code === 'ENOENT' ? 'no such file' : code === 'EACCES' ? 'permission denied' : 'is a directory'}\n`);
      return 1;
    }
    throw e;
  }
  io.stdout.write(values.json ? `${JSON.stringify(analysis, null, 2)}\n` : summary(file, analysis));
  return 0;
}

/** Print a usage error; exit status 2. */
function usage(io: TraceIo, message: string): number {
  io.stderr.write(`error: ${message}\n${TRACE_USAGE}\n`);
  return 2;
}

/** undefined when absent, null when not a positive finite number. */
function positive(s: string | undefined): number | undefined | null {
  if (s === undefined) return undefined;
  const x = Number(s);
  return s.trim() !== '' && Number.isFinite(x) && x > 0 ? x : null;
}

/** A few human-readable lines for a terminal. */
function summary(file: string, r: TraceAnalysis): string {
  const ch = (k: 'a' | 'b'): string => {
    const c = r.channels[k];
    return `  ${k.toUpperCase()}: ${c.lowV} V / ${c.highV} V, ${c.freqHz} Hz, duty ${c.dutyPct}%, ${c.edges} edges, ${c.glitches} glitches${c.stuck ? ', stuck' : ''}`;
  };
  const lines = [
    `${file}: ${r.verdict}`,
    `  ${r.samples} samples at ${r.sampleRateHz} Hz (${r.durationS} s)`,
    ch('a'),
    ch('b'),
    `  phase ${r.phaseDeg}° (${r.direction}), correlation ${r.correlation}${r.rpm !== null ? `, ${r.rpm} rpm` : ''}`,
    ...r.findings.map((f) => `  - ${f.code}${f.channel ? ` (${f.channel.toUpperCase()})` : ''}: ${f.message}`),
  ];
  return `${lines.join('\n')}\n`;
}
