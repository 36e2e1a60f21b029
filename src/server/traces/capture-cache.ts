/**
 * A small in-memory LRU of parsed captures, keyed by the content hash of the stored file, for the trace
 * plot: zooming asks for one window after another, and re-reading and re-parsing a 48 MB capture for each
 * would take about a third of a second every time. An entry holds the sample arrays (three Float64Arrays,
 * 24 bytes a sample) and the edges the analysis found. Entries are dropped least recently used first once
 * MAX_CACHE_BYTES or MAX_CACHE_ENTRIES is passed. Concurrent loads of the same file share one promise.
 * Edit when the cache should hold more, or when a parsed capture gains arrays.
 */
import { readFile } from 'node:fs/promises';
import type { CaptureData } from '@/lib/traces/capture-parse';
import { parseCapture } from '@/lib/traces/capture-parse';
import { analyzeCaptureDetail } from '@/lib/traces/analyze';
import type { EdgeTrain } from '@/lib/traces/crossings';

/** Bytes of sample arrays kept at most (a full-size capture is 48 MB, so about three of them). */
export const MAX_CACHE_BYTES = 160 * 1024 * 1024;
/** Captures kept at most. */
export const MAX_CACHE_ENTRIES = 12;

/** A parsed capture ready for windowing. */
export interface CachedCapture {
  sha256: string;
  capture: CaptureData;
  edges: { a: EdgeTrain; b: EdgeTrain };
  /** Memory held by the arrays, bytes. */
  bytes: number;
}

const entries = new Map<string, CachedCapture>(); // Map order is recency: re-inserted on every hit
const loading = new Map<string, Promise<CachedCapture>>();
let held = 0;
const counters = { hits: 0, misses: 0 };

function touch(e: CachedCapture): CachedCapture {
  entries.delete(e.sha256);
  entries.set(e.sha256, e);
  return e;
}

function admit(e: CachedCapture): void {
  entries.set(e.sha256, e);
  held += e.bytes;
  for (const [key, old] of entries) {
    if (held <= MAX_CACHE_BYTES && entries.size <= MAX_CACHE_ENTRIES) break;
    if (key === e.sha256) continue; // never evict what was just loaded, even when it alone passes the budget
    entries.delete(key);
    held -= old.bytes;
  }
}

/** A cache entry for arrays already parsed. */
function entryOf(sha256: string, capture: CaptureData, edges: { a: EdgeTrain; b: EdgeTrain }): CachedCapture {
  // The whole buffers: a parsed array may be a view of a larger one.
  const size = capture.time.buffer.byteLength + capture.a.buffer.byteLength + capture.b.buffer.byteLength + edges.a.timesS.byteLength + edges.b.timesS.byteLength;
  return { sha256, capture: { time: capture.time, a: capture.a, b: capture.b }, edges, bytes: size };
}

/** Parse bytes and find their edges (the same analysis as at upload; options do not change the edges). */
export function prepareCapture(sha256: string, bytes: Uint8Array): CachedCapture {
  const capture = parseCapture(bytes);
  return entryOf(sha256, capture, analyzeCaptureDetail(capture).edges);
}

/** Keep a capture parsed elsewhere (at upload), unless it is cached already. */
export function rememberCapture(sha256: string, capture: CaptureData, edges: { a: EdgeTrain; b: EdgeTrain }): void {
  const hit = entries.get(sha256);
  if (hit) touch(hit);
  else admit(entryOf(sha256, capture, edges));
}

/**
 * The parsed capture stored at `filePath` with content hash `sha256`, from the cache or read and parsed now.
 * Throws what reading or parsing throws (ENOENT, CaptureError); nothing is cached then.
 */
export async function loadCapture(sha256: string, filePath: string): Promise<CachedCapture> {
  const hit = entries.get(sha256);
  if (hit) {
    counters.hits++;
    return touch(hit);
  }
  const pending = loading.get(sha256);
  if (pending) {
    counters.hits++;
    return pending;
  }
  counters.misses++;
  const p = readFile(filePath).then((buffer) => {
    const entry = prepareCapture(sha256, new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength));
    admit(entry);
    return entry;
  });
  loading.set(sha256, p);
  try {
    return await p;
  } finally {
    loading.delete(sha256);
  }
}

/** What the cache holds and how often it answered (for the benchmark and tests). */
export function captureCacheStats(): { entries: number; bytes: number; hits: number; misses: number } {
  return { entries: entries.size, bytes: held, ...counters };
}

/** Empty the cache (tests and benchmarks). */
export function clearCaptureCache(): void {
  entries.clear();
  held = 0;
  counters.hits = 0;
  counters.misses = 0;
}
