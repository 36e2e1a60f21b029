// Traces linked to defects: what the record and the list say about the defect, vehicle, door and uploader;
// the list filters; who sees a trace stored without a defect.
import { beforeAll, describe, expect, it } from 'vitest';
import { body, call } from '../setup/call';
import { addVehicle, baseFleet, personWithToken } from '../factories/fleet';
import * as traces from '../../src/pages/api/traces/index';
import * as trace from '../../src/pages/api/traces/[id]';
import * as defects from '../../src/pages/api/defects/index';
import { captureToCsv, generateCapture } from '../../src/lib/traces/generate';

let tech: { token: string; id: number }, tech2: string, manager: string, viewerSth: string;
let vin: string, defect: { id: number; ref: string }, healthyId: string, shortedId: string, looseId: string;

function form(text: string, fields: Record<string, string> = {}, name = 'capture.csv') {
  const f = new FormData();
  f.set('file', new Blob([text], { type: 'text/csv' }), name);
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  return f;
}

const healthyCsv = captureToCsv(generateCapture({ freqHz: 240, sampleRateHz: 48_000, samples: 4800, phaseDeg: 90, seed: 31 }));
const shortedCsv = captureToCsv(generateCapture({ freqHz: 240, sampleRateHz: 48_000, samples: 4800, bridged: 'wired-and', seed: 32 }));

beforeAll(async () => {
  baseFleet();
  vin = addVehicle('NTH', { fleet: 'N-204' });
  tech = await personWithToken('technician', ['NTH']);
  tech2 = (await personWithToken('technician', ['NTH'])).token;
  manager = (await personWithToken('manager')).token;
  viewerSth = (await personWithToken('viewer', ['STH'])).token;
  defect = await body(await call(defects, 'POST', '/api/defects', { token: tech.token, json: { vin, position: 'FL', moduleCode: 'WLR-2' } }));
  const post = async (csv: string, fields: Record<string, string>, name?: string) => {
    const res = await call(traces, 'POST', '/api/traces', { token: tech.token, body: form(csv, fields, name) });
    expect(res.status).toBe(201);
    return (await body(res)).id as string;
  };
  healthyId = await post(healthyCsv, { defectId: String(defect.id), pulsesPerRev: '4' }, 'fl-after-repair.csv');
  shortedId = await post(shortedCsv, { defectId: String(defect.id) }, 'fl-before.csv');
  looseId = await post(healthyCsv, {}, 'bench.csv');
});

describe('a trace stored on a defect', () => {
  it('names the defect, vehicle, door, depot, file and who stored it', async () => {
    const r = await body(await call(trace, 'GET', `/api/traces/${healthyId}`, { token: tech.token, params: { id: healthyId } }));
    expect(r).toMatchObject({
      id: healthyId,
      defectId: defect.id,
      defectRef: defect.ref,
      vin,
      fleetNumber: 'N-204',
      position: 'FL',
      depotCode: 'NTH',
      fileName: 'fl-after-repair.csv',
      createdBy: 'technician person',
      pulsesPerRev: 4,
      verdict: 'healthy',
    });
    expect(r.rpm).toBeCloseTo((240 * 60) / 4, 0);
    expect(r.bytes).toBe(new TextEncoder().encode(healthyCsv).length);
    expect(Date.parse(r.createdAt)).toBeGreaterThan(Date.now() - 60_000);
    for (const f of r.findings) expect(Object.keys(f).sort()).toEqual(['cause', 'channel', 'check', 'code', 'meaning', 'message', 'title']);
  });

  it('lists the defect traces newest first, and filters by verdict and depot', async () => {
    const all = await body(await call(traces, 'GET', `/api/traces?defectId=${defect.id}`, { token: tech.token }));
    expect(all.items.map((t: { id: string }) => t.id)).toEqual([shortedId, healthyId]);
    expect(all.items[0]).toMatchObject({ verdict: 'channels_shorted', defectRef: defect.ref, position: 'FL' });
    const shorted = await body(await call(traces, 'GET', `/api/traces?verdict=channels_shorted`, { token: tech.token }));
    expect(shorted.items.map((t: { id: string }) => t.id)).toEqual([shortedId]);
    expect(shorted.total).toBe(1);
    const nth = await body(await call(traces, 'GET', `/api/traces?depot=NTH`, { token: manager }));
    expect(nth.total).toBe(2);
    const sth = await body(await call(traces, 'GET', `/api/traces?depot=STH`, { token: manager }));
    expect(sth.total).toBe(0);
  });

  it('is hidden outside its depot (404 for the record, absent from the list)', async () => {
    expect((await call(trace, 'GET', `/api/traces/${healthyId}`, { token: viewerSth, params: { id: healthyId } })).status).toBe(404);
    const list = await body(await call(traces, 'GET', '/api/traces', { token: viewerSth }));
    expect(list.total).toBe(0);
  });

  it('400 for an unknown verdict or a bad page', async () => {
    for (const q of ['verdict=broken', 'page=0', 'pageSize=500', 'defectId=x']) {
      const res = await call(traces, 'GET', `/api/traces?${q}`, { token: tech.token });
      expect(res.status, q).toBe(400);
      expect((await body(res)).error.code).toBe('INVALID_INPUT');
    }
  });

  it('401 without credentials', async () => {
    expect((await call(traces, 'GET', '/api/traces')).status).toBe(401);
    expect((await call(trace, 'GET', `/api/traces/${healthyId}`, { params: { id: healthyId } })).status).toBe(401);
  });
});

describe('a trace stored without a defect', () => {
  it('is seen by the person who stored it and by people who see every depot, not by a colleague', async () => {
    const own = await body(await call(trace, 'GET', `/api/traces/${looseId}`, { token: tech.token, params: { id: looseId } }));
    expect(own).toMatchObject({ defectId: null, defectRef: null, vin: null, depotCode: null, fileName: 'bench.csv' });
    expect((await call(trace, 'GET', `/api/traces/${looseId}`, { token: manager, params: { id: looseId } })).status).toBe(200);
    expect((await call(trace, 'GET', `/api/traces/${looseId}`, { token: tech2, params: { id: looseId } })).status).toBe(404);
    const colleague = await body(await call(traces, 'GET', '/api/traces', { token: tech2 }));
    expect(colleague.items.map((t: { id: string }) => t.id)).toEqual([shortedId, healthyId]);
  });
});
