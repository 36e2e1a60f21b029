// GET /api/traces/{id}/samples (plot windows) and GET /api/traces/{id}/file (the original capture), with
// captures generated from known parameters.
import fs from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { body, call } from '../setup/call';
import { addVehicle, baseFleet, personWithToken } from '../factories/fleet';
import * as traces from '../../src/pages/api/traces/index';
import * as samples from '../../src/pages/api/traces/[id]/samples';
import * as file from '../../src/pages/api/traces/[id]/file';
import * as defects from '../../src/pages/api/defects/index';
import { captureToCsv, generateCapture } from '../../src/lib/traces/generate';
import { captureCacheStats, clearCaptureCache } from '../../src/server/traces/capture-cache';

let tech: string, viewerSth: string, managerAll: string, traceId: string, csv: string;
/** 20,000 samples at 100 kS/s (0.2 s), 200 Hz, with one 1-sample spike of 9 V on B at sample 12,345. */
const SPIKE_INDEX = 12_345;

function form(text: string, fields: Record<string, string> = {}, name = 'door-fr.csv') {
  const f = new FormData();
  f.set('file', new Blob([text], { type: 'text/csv' }), name);
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  return f;
}

const get = (id: string, query: string, token?: string) => call(samples, 'GET', `/api/traces/${id}/samples${query}`, { token, params: { id } });

beforeAll(async () => {
  baseFleet();
  const vin = addVehicle('NTH');
  tech = (await personWithToken('technician', ['NTH'])).token;
  viewerSth = (await personWithToken('viewer', ['STH'])).token;
  managerAll = (await personWithToken('manager')).token;
  const defectId = (await body(await call(defects, 'POST', '/api/defects', { token: tech, json: { vin, position: 'FR', moduleCode: 'WLR-2' } }))).id;
  const g = generateCapture({ freqHz: 200, sampleRateHz: 100_000, samples: 20_000, phaseDeg: 90, lowV: 0.2, highV: 5, noiseV: 0.02, seed: 11 });
  g.b[SPIKE_INDEX] = 9;
  csv = captureToCsv(g, { timeUnit: 'ms' });
  const res = await call(traces, 'POST', '/api/traces', { token: tech, body: form(csv, { defectId: String(defectId) }) });
  expect(res.status).toBe(201);
  traceId = (await body(res)).id;
});

describe('GET /api/traces/{id}/samples', () => {
  it('401 without credentials', async () => {
    expect((await get(traceId, '')).status).toBe(401);
  });

  it('404 for a trace outside the caller depots, an unknown id and a malformed id', async () => {
    for (const [id, token] of [[traceId, viewerSth], ['999999', tech], ['abc', tech], ['-1', tech]] as const) {
      const res = await get(id, '', token);
      expect(res.status, `${id}`).toBe(404);
      expect((await body(res)).error.code).toBe('NOT_FOUND');
    }
  });

  it.each([
    ['columns=0', 'columns'],
    ['columns=abc', 'columns'],
    ['columns=4001', 'columns'],
    ['columns=1.5', 'columns'],
    ['from=soon', 'from'],
    ['from=0.1&to=0.05', 'to'],
    ['from=0.1&to=0.1', 'to'],
    ['from=5&to=6', 'from'],
    ['to=-1', 'from'],
    ['from=1e999', 'from'],
  ])('400 for %s, naming %s', async (query, field) => {
    const res = await get(traceId, `?${query}`, tech);
    expect(res.status).toBe(400);
    const e = (await body(res)).error;
    expect(e.code).toBe('INVALID_INPUT');
    expect(e.issues.map((i: { path: string }) => i.path)).toContain(field);
  });

  it('decimates the whole capture to min/max columns; the one-sample spike survives', async () => {
    const res = await get(traceId, '?columns=300', tech);
    expect(res.status).toBe(200);
    const w = await body(res);
    expect(w.mode).toBe('minmax');
    expect(w.columns).toBe(300);
    expect(w.totalSamples).toBe(20_000);
    expect(w.windowSamples).toBe(20_000);
    expect(w.fromS).toBe(0);
    expect(w.toS).toBeCloseTo(0.19999, 9);
    for (const k of ['a', 'b']) {
      expect(w[k].min).toHaveLength(300);
      expect(w[k].max).toHaveLength(300);
      for (let c = 0; c < 300; c++) expect(w[k].min[c]).toBeLessThanOrEqual(w[k].max[c]);
    }
    expect(w.timeS).toHaveLength(300);
    expect(Math.max(...w.b.max)).toBe(9);
    // The spike's column: 0.12345 s of 0.19999 s over 300 columns.
    const column = Math.floor((0.12345 / 0.19999) * 300);
    expect(w.b.max[column]).toBe(9);
    // 40 periods of 200 Hz: 80 edges a channel in the whole window, listed with their polarity.
    expect(w.edges.a.count).toBe(80);
    expect(w.edges.a.timesS).toHaveLength(80);
    expect(typeof w.edges.a.firstRising).toBe('boolean');
  });

  it('returns every sample once zoomed in far enough (fewer than two samples a column)', async () => {
    const w = await body(await get(traceId, '?from=0.1234&to=0.1236&columns=800', tech));
    expect(w.mode).toBe('raw');
    expect(w.windowSamples).toBe(21);
    expect(w.timeS).toHaveLength(21);
    expect(w.timeS[0]).toBeCloseTo(0.1234, 12);
    expect(w.timeS[20]).toBeCloseTo(0.1236, 12);
    expect(w.b.max).toBeNull();
    expect(w.b.min[5]).toBe(9); // sample 12,345 = 0.12345 s
  });

  it('serves repeated windows from the parsed-capture cache', async () => {
    clearCaptureCache();
    await get(traceId, '?columns=100', tech);
    const first = captureCacheStats();
    expect(first).toMatchObject({ entries: 1, misses: 1, hits: 0 });
    await get(traceId, '?from=0.01&to=0.02&columns=100', tech);
    await get(traceId, '?from=0.015&to=0.016&columns=100', tech);
    expect(captureCacheStats()).toMatchObject({ entries: 1, misses: 1, hits: 2 });
  });

  it('keeps a capture parsed at upload, so its first plot window needs no read', async () => {
    clearCaptureCache();
    const g = generateCapture({ freqHz: 90, sampleRateHz: 20_000, samples: 4_000, seed: 13 });
    const r = await body(await call(traces, 'POST', '/api/traces', { token: tech, body: form(captureToCsv(g)) }));
    expect(captureCacheStats()).toMatchObject({ entries: 1, misses: 0 });
    expect((await get(r.id, '?columns=50', tech)).status).toBe(200);
    expect(captureCacheStats()).toMatchObject({ entries: 1, misses: 0, hits: 1 });
  });

  it('answers 404 (not 500) when the stored file has gone', async () => {
    const g = generateCapture({ freqHz: 150, sampleRateHz: 30_000, samples: 3_000, seed: 12 });
    const r = await body(await call(traces, 'POST', '/api/traces', { token: tech, body: form(captureToCsv(g)) }));
    const dir = path.join(process.env.UPLOAD_DIR!, 'traces');
    const stored = fs.readdirSync(dir, { recursive: true, withFileTypes: true }).filter((e) => e.isFile());
    const text = captureToCsv(g);
    const victim = stored.find((e) => fs.readFileSync(path.join(e.parentPath, e.name), 'utf8') === text)!;
    fs.rmSync(path.join(victim.parentPath, victim.name));
    clearCaptureCache();
    const res = await get(r.id, '', tech);
    expect(res.status).toBe(404);
    expect((await body(res)).error.message).toMatch(/missing/);
    expect((await call(file, 'GET', `/api/traces/${r.id}/file`, { token: tech, params: { id: r.id } })).status).toBe(404);
  });
});

describe('GET /api/traces/{id}/file', () => {
  it('downloads the original capture, byte for byte, under its file name', async () => {
    const res = await call(file, 'GET', `/api/traces/${traceId}/file`, { token: tech, params: { id: traceId } });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(res.headers.get('content-disposition')).toBe(`attachment; filename="door-fr.csv"; filename*=UTF-8''door-fr.csv`);
    expect(await res.text()).toBe(csv);
  });

  it('401 without credentials, 404 outside the depots; managers see every depot', async () => {
    expect((await call(file, 'GET', `/api/traces/${traceId}/file`, { params: { id: traceId } })).status).toBe(401);
    expect((await call(file, 'GET', `/api/traces/${traceId}/file`, { token: viewerSth, params: { id: traceId } })).status).toBe(404);
    expect((await call(file, 'GET', `/api/traces/${traceId}/file`, { token: managerAll, params: { id: traceId } })).status).toBe(200);
  });

  it('is GET only', async () => {
    expect((await call(file, 'DELETE', `/api/traces/${traceId}/file`, { token: tech, params: { id: traceId } })).status).toBe(405);
  });
});
