// Bad input and scope edges found by probing the API from outside: each must answer in the error shape (never a
// 500), and nothing of another depot may show through counts.
import { beforeAll, describe, expect, it } from 'vitest';
import { body, call } from '../setup/call';
import { addVehicle, baseFleet, importCsv, personWithToken } from '../factories/fleet';
import * as rest from '../../src/pages/api/[...rest]';
import * as defects from '../../src/pages/api/defects/index';
import * as vehicle from '../../src/pages/api/vehicles/[vin]';
import * as vehiclesRoute from '../../src/pages/api/vehicles/index';
import * as modulesRoute from '../../src/pages/api/modules/index';
import * as depotsRoute from '../../src/pages/api/depots/index';

let manager: string, viewerSth: string, techNth: string;
let vin: string;

beforeAll(async () => {
  baseFleet();
  importCsv('modules', 'code,name,function\nQA-1,Trial 50%_off switch,switch\nQA-2,Trial 50 off switch,switch\n');
  vin = addVehicle('NTH');
  manager = (await personWithToken('manager')).token;
  viewerSth = (await personWithToken('viewer', ['STH'])).token;
  techNth = (await personWithToken('technician', ['NTH'])).token;
  const r = await call(defects, 'POST', '/api/defects', { token: techNth, json: { vin, position: 'FL', moduleCode: 'WLR-2', symptom: 'no auto up' } });
  expect(r.status).toBe(201);
});

describe('routes that do not exist', () => {
  it('an unknown /api path is a 404 in the error shape, after the credentials check', async () => {
    expect((await call(rest, 'GET', '/api/nothing-here')).status).toBe(401);
    const r = await call(rest, 'GET', '/api/nothing-here', { token: manager });
    expect(r.status).toBe(404);
    expect((await body(r)).error).toEqual({ code: 'NOT_FOUND', message: 'There is no API route /api/nothing-here.' });
  });
  it.each(['/api/auth/foo', '/api/auth/webauthn-options', '/api/auth/..%2Fdefects'])('%s is a 404 in the error shape, not a 500 from the sign-in library', async (path) => {
    for (const method of ['GET', 'POST']) {
      const r = await call(rest, method, path);
      expect(r.status).toBe(404);
      expect((await body(r)).error.code).toBe('NOT_FOUND');
    }
  });
});

describe('request bodies', () => {
  it('refuses JSON that is not valid UTF-8 with 400, writing nothing', async () => {
    const before = (await body(await call(defects, 'GET', '/api/defects', { token: manager }))).total;
    const bytes = new Uint8Array([...new TextEncoder().encode(`{"vin":"${vin}","position":"FR","moduleCode":"WLR-2","symptom":"bad `), 0xff, 0xfe, ...new TextEncoder().encode('"}')]);
    const r = await call(defects, 'POST', '/api/defects', { token: techNth, body: bytes, headers: { 'content-type': 'application/json' } });
    expect(r.status).toBe(400);
    expect((await body(r)).error).toMatchObject({ code: 'INVALID_INPUT', message: 'The request body is not valid UTF-8 text.' });
    expect((await body(await call(defects, 'GET', '/api/defects', { token: manager }))).total).toBe(before);
  });
});

describe('search text is literal', () => {
  it('% and _ in q match themselves in module and depot searches', async () => {
    const mods = await body(await call(modulesRoute, 'GET', `/api/modules?q=${encodeURIComponent('50%_off')}`, { token: manager }));
    expect(mods.items.map((m: { code: string }) => m.code)).toEqual(['QA-1']);
    const none = await body(await call(depotsRoute, 'GET', `/api/depots?q=${encodeURIComponent('%')}`, { token: manager }));
    expect(none.total).toBe(0);
    const quay = await body(await call(depotsRoute, 'GET', `/api/depots?q=${encodeURIComponent('h Q')}`, { token: manager }));
    expect(quay.items.map((d: { code: string }) => d.code)).toEqual(['NTH']);
  });
});

describe('a vehicle that moves depot', () => {
  it('keeps its defects with the depot that reported them: the new depot sees no count of them', async () => {
    const moved = await call(vehicle, 'PATCH', `/api/vehicles/${vin}`, { token: manager, params: { vin }, json: { depotCode: 'STH' } });
    expect(moved.status).toBe(200);
    // The manager (every depot) still counts the defect; the STH viewer sees the vehicle without it.
    expect((await body(await call(vehicle, 'GET', `/api/vehicles/${vin}`, { token: manager, params: { vin } }))).defects).toBe(1);
    const seen = await body(await call(vehicle, 'GET', `/api/vehicles/${vin}`, { token: viewerSth, params: { vin } }));
    expect(seen).toMatchObject({ depotCode: 'STH', defects: 0, openDefects: 0 });
    const listed = await body(await call(vehiclesRoute, 'GET', `/api/vehicles?vin=${vin}`, { token: viewerSth }));
    expect(listed.items[0]).toMatchObject({ defects: 0, openDefects: 0 });
    expect((await body(await call(defects, 'GET', `/api/defects?vin=${vin}`, { token: viewerSth }))).total).toBe(0);
    // The NTH technician no longer sees the vehicle at all.
    expect((await call(vehicle, 'GET', `/api/vehicles/${vin}`, { token: techNth, params: { vin } })).status).toBe(404);
  });
});
