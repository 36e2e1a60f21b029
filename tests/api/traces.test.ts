// POST /api/traces and its stored records, with captures generated from known parameters.
import { beforeAll, describe, expect, it } from 'vitest';
import { call, body } from '../setup/call';
import { addVehicle, baseFleet, personWithToken } from '../factories/fleet';
import * as traces from '../../src/pages/api/traces/index';
import * as trace from '../../src/pages/api/traces/[id]';
import * as defects from '../../src/pages/api/defects/index';
import { captureToCsv, generateCapture } from '../../src/lib/traces/generate';

let tech: string, viewerSth: string, defectId: number;

function form(csv: string, fields: Record<string, string> = {}) {
  const f = new FormData();
  f.set('file', new Blob([csv], { type: 'text/csv' }), 'capture.csv');
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  return f;
}

beforeAll(async () => {
  baseFleet();
  const vin = addVehicle('NTH');
  tech = (await personWithToken('technician', ['NTH'])).token;
  viewerSth = (await personWithToken('viewer', ['STH'])).token;
  defectId = (await body(await call(defects, 'POST', '/api/defects', { token: tech, json: { vin, position: 'FR', moduleCode: 'WLR-2' } }))).id;
});

describe('POST /api/traces', () => {
  it('measures a healthy 5 V quadrature capture and stores it on the defect', async () => {
    const cap = generateCapture({ freqHz: 200, dutyPct: 50, phaseDeg: 90, highV: 5, lowV: 0, sampleRateHz: 50_000, samples: 5000, noiseV: 0.02, seed: 3 });
    const res = await call(traces, 'POST', '/api/traces', { token: tech, body: form(captureToCsv(cap), { defectId: String(defectId), pulsesPerRev: '2' }) });
    expect(res.status).toBe(201);
    const r = await body(res);
    expect(r.verdict).toBe('healthy');
    expect(r.direction).toBe('a_leads');
    expect(Math.abs(r.channels.a.freqHz - 200) / 200).toBeLessThan(0.01);
    expect(Math.abs(r.phaseDeg - 90)).toBeLessThan(3);
    const stored = await body(await call(trace, 'GET', `/api/traces/${r.id}`, { token: tech, params: { id: r.id } }));
    expect(stored).toMatchObject({ id: r.id, defectId, verdict: 'healthy' });
    const list = await body(await call(traces, 'GET', `/api/traces?defectId=${defectId}`, { token: tech }));
    expect(list.items.map((t: { id: string }) => t.id)).toEqual([r.id]);
  });
  it('calls bridged channels shorted', async () => {
    const cap = generateCapture({ freqHz: 150, dutyPct: 50, phaseDeg: 90, highV: 5, lowV: 0, sampleRateHz: 40_000, samples: 4000, bridged: 'wired-and', spikeV: 1, seed: 4 });
    const r = await body(await call(traces, 'POST', '/api/traces', { token: tech, body: form(captureToCsv(cap)) }));
    expect(r.verdict).toBe('channels_shorted');
  });
  it('hides a trace in another depot and refuses a defect outside the scope', async () => {
    const list = await body(await call(traces, 'GET', `/api/traces?defectId=${defectId}`, { token: viewerSth }));
    expect(list.total).toBe(0);
    const cap = generateCapture({ freqHz: 100, dutyPct: 50, phaseDeg: 90, highV: 5, lowV: 0, sampleRateHz: 20_000, samples: 2000, seed: 5 });
    const other = await personWithToken('technician', ['STH']);
    const res = await call(traces, 'POST', '/api/traces', { token: other.token, body: form(captureToCsv(cap), { defectId: String(defectId) }) });
    expect(res.status).toBe(422);
  });
  it.each([
    ['no numeric rows', 'time,a,b\nx,y,z\n'],
    ['one channel', 'time (s),A\n0,0\n0.001,5\n0.002,0\n'],
    ['empty', ''],
  ])('rejects a file with %s, in the error shape', async (_n, csv) => {
    const res = await call(traces, 'POST', '/api/traces', { token: tech, body: form(csv) });
    expect(res.status).toBe(422);
    expect((await body(res)).error.code).toBe('INVALID_INPUT');
  });
  it('viewers cannot upload and bad options are a 400', async () => {
    expect((await call(traces, 'POST', '/api/traces', { token: viewerSth, body: form('t,a,b\n') })).status).toBe(403);
    expect((await call(traces, 'POST', '/api/traces', { token: tech, body: form('t,a,b\n', { supplyV: '-5' }) })).status).toBe(400);
    expect((await call(traces, 'POST', '/api/traces', { token: tech, json: { file: 'x' } })).status).toBe(415);
  });
});
