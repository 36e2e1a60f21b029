/**
 * Server-side capture analysis from a file on disk (used by the `trace` CLI command and anything else that
 * holds a capture as a path). Reads the whole file into one Buffer and hands the bytes to the pure parser,
 * which builds typed arrays directly (no per-line strings). Edit when the size limit or the read changes.
 */
import { readFile, stat } from 'node:fs/promises';
import { CaptureError, parseCapture } from '@/lib/traces/capture-parse';
import { analyzeCapture, type AnalyzeOptions, type TraceAnalysis } from '@/lib/traces/analyze';

/** Largest capture file read, bytes (2,000,000 rows of generous width fit well inside). */
export const MAX_CAPTURE_FILE_BYTES = 200 * 1024 * 1024;

/** Read, parse and analyse the capture at `path`; throws CaptureError for a file the analysis cannot use. */
export async function analyzeCaptureFile(path: string, opts: AnalyzeOptions = {}): Promise<TraceAnalysis> {
  const info = await stat(path);
  if (!info.isFile()) throw new CaptureError('not a file');
  if (info.size > MAX_CAPTURE_FILE_BYTES) {
    throw new CaptureError(
      `the file is ${(info.size / 1048576).toFixed(0)} MB; captures up to ${MAX_CAPTURE_FILE_BYTES / 1048576} MB are read`,
    );
  }
  const bytes = await readFile(path);
  return analyzeCapture(parseCapture(bytes), opts);
}
