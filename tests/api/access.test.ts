// Access rules of CONTRACT.md "Who may do what", through the real guard and route handlers.
import { beforeAll, describe, expect, it } from 'vitest';
import { call, body } from '../setup/call';
import { addVehicle, baseFleet, personWithToken } from '../factories/fleet';
import * as vehicles from '../../src/pages/api/vehicles/index';
import * as vehicle from '../../src/pages/api/vehicles/[vin]';
import * as defects from '../../src/pages/api/defects/index';
import * as defect from '../../src/pages/api/defects/[id]';
import * as depots from '../../src/pages/api/depots/index';
import * as modulesRoute from '../../src/pages/api/modules/index';
import * as users from '../../src/pages/api/users/index';
import * as tokens from '../../src/pages/api/tokens/index';
import * as importRoute from '../../src/pages/api/import/[kind]';
import * as health from '../../src/pages/api/health';
import * as rest from '../../src/pages/api/[...rest]';

let admin: string, manager: string, supNth: string, techNth: string, viewerSth: string, viewerAll: string;
let vinNth: string, vinSth: string, defectNth: number;

beforeAll(async () => {
  baseFleet();
  vinNth = addVehicle('NTH');
  vinSth = addVehicle('STH');
  admin = (await personWithToken('admin')).token;
  manager = (await personWithToken('manager')).token;
  supNth = (await personWithToken('supervisor', ['NTH'])).token;
  techNth = (await personWithToken('technician', ['NTH'])).token;
  viewerSth = (await personWithToken('viewer', ['STH'])).token;
  viewerAll = (await personWithToken('viewer')).token;
  const r = await call(defects, 'POST', '/api/defects', { token: techNth, json: { vin: vinNth, position: 'FL', moduleCode: 'WLR-2', symptom: 'no auto up' } });
  expect(r.status).toBe(201);
  defectNth = (await body(r)).id;
});

describe('authentication', () => {
  it('answers 401 with the error shape without credentials', async () => {
    const r = await call(vehicles, 'GET', '/api/vehicles');
    expect(r.status).toBe(401);
    expect((await body(r)).error.code).toBe('UNAUTHENTICATED');
  });
  it('answers 401 for an unknown or malformed token', async () => {
    expect((await call(vehicles, 'GET', '/api/vehicles', { token: 'spl_nope' })).status).toBe(401);
    expect((await call(vehicles, 'GET', '/api/vehicles', { headers: { authorization: 'Basic abc' } })).status).toBe(401);
  });
  it('keeps /api/health open and says nothing else', async () => {
    const r = await call(health, 'GET', '/api/health');
    expect(r.status).toBe(200);
    expect(await body(r)).toEqual({ ok: true, db: 'ok' });
  });
  it('unknown API paths are 401 signed out and a JSON 404 signed in', async () => {
    expect((await call(rest, 'GET', '/api/nothing-here')).status).toBe(401);
    const r = await call(rest, 'GET', '/api/nothing-here', { token: admin });
    expect(r.status).toBe(404);
    expect((await body(r)).error.code).toBe('NOT_FOUND');
  });
});

describe('roles', () => {
  it.each([
    ['manager', () => manager, 201],
    ['supervisor', () => supNth, 403],
    ['technician', () => techNth, 403],
    ['viewer', () => viewerAll, 403],
  ])('creating a depot as %s -> %i', async (_role, tok, status) => {
    const code = `D${Math.random().toString(36).slice(2, 6).toUpperCase()}`;
    const r = await call(depots, 'POST', '/api/depots', {
      token: tok(),
      json: { code, name: 'New', coastal: false, rainDaysPerYear: 100, meanRhPct: 70, washBay: false },
    });
    expect(r.status).toBe(status);
    if (status === 403) expect((await body(r)).error.code).toBe('FORBIDDEN');
  });
  it('only admins create people and tokens', async () => {
    const person = { email: 'new.person@example.test', name: 'New Person', role: 'viewer', password: 'long enough pw', allDepots: true };
    expect((await call(users, 'POST', '/api/users', { token: manager, json: person })).status).toBe(403);
    expect((await call(users, 'POST', '/api/users', { token: admin, json: person })).status).toBe(201);
    expect((await call(tokens, 'POST', '/api/tokens', { token: manager, json: { email: person.email } })).status).toBe(403);
    const t = await call(tokens, 'POST', '/api/tokens', { token: admin, json: { email: person.email, label: 'feed' } });
    expect(t.status).toBe(201);
    const { token } = await body(t);
    expect(token).toMatch(/^spl_/);
    expect((await call(vehicles, 'GET', '/api/vehicles', { token })).status).toBe(200);
  });
  it('imports are for admins and managers only', async () => {
    const csv = 'code,name,function\nMRR-1,Mirror motor,mirror\n';
    for (const t of [supNth, techNth, viewerAll]) {
      const r = await call(importRoute, 'POST', '/api/import/modules', { token: t, params: { kind: 'modules' }, body: csv, headers: { 'content-type': 'text/csv' } });
      expect(r.status).toBe(403);
    }
    const r = await call(importRoute, 'POST', '/api/import/modules', { token: manager, params: { kind: 'modules' }, body: csv, headers: { 'content-type': 'text/csv' } });
    expect(r.status).toBe(200);
  });
  it('viewers read but do not write defects; modules are read by everyone', async () => {
    expect((await call(defects, 'POST', '/api/defects', { token: viewerAll, json: { vin: vinNth, position: 'FL', moduleCode: 'WLR-2' } })).status).toBe(403);
    expect((await call(modulesRoute, 'GET', '/api/modules', { token: viewerSth })).status).toBe(200);
    expect((await call(modulesRoute, 'POST', '/api/modules', { token: supNth, json: { code: 'X-1', name: 'x', function: 'other' } })).status).toBe(403);
  });
});

describe('depot scope', () => {
  it('lists only the caller’s depots', async () => {
    const r = await body(await call(vehicles, 'GET', '/api/vehicles', { token: supNth }));
    expect(r.items.map((v: { vin: string }) => v.vin)).toEqual([vinNth]);
    const all = await body(await call(vehicles, 'GET', '/api/vehicles', { token: viewerAll }));
    expect(all.total).toBe(2);
    const dep = await body(await call(depots, 'GET', '/api/depots', { token: viewerSth }));
    expect(dep.items.map((d: { code: string }) => d.code)).toEqual(['STH']);
  });
  it('answers 404, not 403, for a vehicle or defect in another depot', async () => {
    const v = await call(vehicle, 'GET', `/api/vehicles/${vinSth}`, { token: supNth, params: { vin: vinSth } });
    expect(v.status).toBe(404);
    expect((await call(vehicle, 'GET', `/api/vehicles/${vinNth}`, { token: supNth, params: { vin: vinNth } })).status).toBe(200);
    const d = await call(defect, 'GET', `/api/defects/${defectNth}`, { token: viewerSth, params: { id: String(defectNth) } });
    expect(d.status).toBe(404);
    expect((await call(defect, 'GET', `/api/defects/${defectNth}`, { token: techNth, params: { id: String(defectNth) } })).status).toBe(200);
  });
  it('a filter on a depot outside the scope returns nothing', async () => {
    const r = await body(await call(vehicles, 'GET', '/api/vehicles?depot=STH', { token: supNth }));
    expect(r).toMatchObject({ items: [], total: 0 });
  });
  it('a technician cannot report a defect on a vehicle outside their depots', async () => {
    const r = await call(defects, 'POST', '/api/defects', { token: techNth, json: { vin: vinSth, position: 'FL', moduleCode: 'WLR-2' } });
    expect(r.status).toBe(422);
    expect((await body(r)).error.message).toMatch(/No vehicle/);
  });
  it('a supervisor cannot move a vehicle into a depot outside their scope', async () => {
    const r = await call(vehicle, 'PATCH', `/api/vehicles/${vinNth}`, { token: supNth, params: { vin: vinNth }, json: { depotCode: 'STH' } });
    expect(r.status).toBe(422);
    const after = await body(await call(vehicle, 'GET', `/api/vehicles/${vinNth}`, { token: supNth, params: { vin: vinNth } }));
    expect(after.depotCode).toBe('NTH');
  });
});

describe('cross-site protection for cookie sessions', () => {
  it('refuses a cookie-authenticated write from a foreign Origin', async () => {
    const { id } = await personWithToken('manager');
    const r = await call(depots, 'POST', '/api/depots', {
      sessionUserId: id,
      headers: { origin: 'http://evil.example', host: 'localhost:4321' },
      json: { code: 'EVL', name: 'x', coastal: false, rainDaysPerYear: 1, meanRhPct: 1, washBay: false },
    });
    expect(r.status).toBe(403);
    const ok = await call(depots, 'POST', '/api/depots', {
      sessionUserId: id,
      headers: { origin: 'http://localhost:4321', host: 'localhost:4321' },
      json: { code: 'SMO', name: 'Same origin', coastal: false, rainDaysPerYear: 1, meanRhPct: 1, washBay: false },
    });
    expect(ok.status).toBe(201);
  });
});

describe('counts in lists', () => {
  it('depot and module lists count their own vehicles and defects', async () => {
    const d = await body(await call(depots, 'GET', '/api/depots', { token: admin }));
    const nth = d.items.find((x: { code: string }) => x.code === 'NTH');
    const sth = d.items.find((x: { code: string }) => x.code === 'STH');
    expect([nth.vehicles, sth.vehicles, nth.openDefects, sth.openDefects]).toEqual([1, 1, 1, 0]);
    const m = await body(await call(modulesRoute, 'GET', '/api/modules', { token: admin }));
    expect(m.items.find((x: { code: string }) => x.code === 'WLR-2').defects).toBe(1);
    expect(m.items.find((x: { code: string }) => x.code === 'LCK-1').defects).toBe(0);
  });
});
