// About a hundred malformed requests across the routes: each gets a 4xx in the error shape and writes nothing.
import { beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { call, type CallOptions } from '../setup/call';
import { addVehicle, baseFleet, personWithToken } from '../factories/fleet';
import * as vehicles from '../../src/pages/api/vehicles/index';
import * as vehicle from '../../src/pages/api/vehicles/[vin]';
import * as defects from '../../src/pages/api/defects/index';
import * as defect from '../../src/pages/api/defects/[id]';
import * as depots from '../../src/pages/api/depots/index';
import * as depot from '../../src/pages/api/depots/[code]';
import * as modulesRoute from '../../src/pages/api/modules/index';
import * as moduleRoute from '../../src/pages/api/modules/[code]';
import * as users from '../../src/pages/api/users/index';
import * as user from '../../src/pages/api/users/[id]';
import * as tokens from '../../src/pages/api/tokens/index';
import * as token from '../../src/pages/api/tokens/[id]';
import * as importRoute from '../../src/pages/api/import/[kind]';
import { getDb } from '../../src/db/client';

let admin: string;
let vin: string;
const snapshot = () =>
  getDb().get<{ s: string }>(
    sql`select (select count(*) from depots)||','||(select count(*) from vehicles)||','||(select count(*) from defects)||','||(select count(*) from users)||','||(select count(*) from modules)||','||(select count(*) from api_tokens where revoked_at is null)||','||(select max(updated_at) from vehicles)||','||(select count(*) from audit_log) as s`,
  ).s;

beforeAll(async () => {
  baseFleet();
  vin = addVehicle('NTH');
  admin = (await personWithToken('admin')).token;
});

type Case = [string, Record<string, unknown>, string, string, Omit<CallOptions, 'token'>];
const json = (j: unknown) => ({ json: j });
const raw = (body: string, type = 'application/json') => ({ body, headers: { 'content-type': type } });

const listRoutes: Array<[string, Record<string, unknown>]> = [
  ['/api/vehicles', vehicles],
  ['/api/defects', defects],
  ['/api/depots', depots],
  ['/api/modules', modulesRoute],
];
const badQueries = ['page=0', 'page=-1', 'page=abc', 'page=1.5', 'pageSize=0', 'pageSize=201', 'pageSize=99999', 'sort=nonsense', 'sort=--vin', 'sort=vin;drop', `q=${'x'.repeat(300)}`];

const cases: Case[] = [
  ...listRoutes.flatMap(([path, route]) => badQueries.map((q): Case => [`GET ${path}?${q.slice(0, 20)}`, route, 'GET', `${path}?${q}`, {}])),
  ['vehicles parking filter', vehicles, 'GET', '/api/vehicles?parking=roof', {}],
  ['vehicles status filter', vehicles, 'GET', '/api/vehicles?status=gone', {}],
  ['defects status filter', defects, 'GET', '/api/defects?status=lost', {}],
  ['defects position filter', defects, 'GET', '/api/defects?position=ZZ', {}],
  ['defects moisture filter', defects, 'GET', '/api/defects?moisture=damp', {}],
  ['defects repeat filter', defects, 'GET', '/api/defects?repeat=maybe', {}],
  ['defects reportedFrom', defects, 'GET', '/api/defects?reportedFrom=yesterday', {}],
  ['modules function filter', modulesRoute, 'GET', '/api/modules?function=wheel', {}],
  // bodies
  ...[vehicles, defects, depots, modulesRoute, users, tokens].flatMap((route, i): Case[] => [
    [`POST #${i} invalid JSON`, route, 'POST', '/x', raw('{"a":')],
    [`POST #${i} JSON array`, route, 'POST', '/x', json([1, 2])],
    [`POST #${i} JSON null`, route, 'POST', '/x', raw('null')],
    [`POST #${i} JSON string`, route, 'POST', '/x', json('hello')],
    [`POST #${i} form body`, route, 'POST', '/x', raw('a=1', 'application/x-www-form-urlencoded')],
    [`POST #${i} empty object`, route, 'POST', '/x', json({})],
    [`POST #${i} no body`, route, 'POST', '/x', { headers: { 'content-type': 'application/json' } }],
  ]),
  ['vehicle bad VIN', vehicles, 'POST', '/x', json({ vin: 'SHORT', buildDate: '2022-01', inServiceDate: '2022-02-01', depotCode: 'NTH', parking: 'indoor', washesPerMonth: 1 })],
  ['vehicle VIN with O', vehicles, 'POST', '/x', json({ vin: 'SXPAB1CD0NK00001O', buildDate: '2022-01', inServiceDate: '2022-02-01', depotCode: 'NTH', parking: 'indoor', washesPerMonth: 1 })],
  ['vehicle washes as object', vehicles, 'POST', '/x', json({ vin: 'SXPAB1CD9NK000777', buildDate: '2022-01', inServiceDate: '2022-02-01', depotCode: 'NTH', parking: 'indoor', washesPerMonth: { a: 1 } })],
  ['vehicle washes 61', vehicles, 'POST', '/x', json({ vin: 'SXPAB1CD9NK000777', buildDate: '2022-01', inServiceDate: '2022-02-01', depotCode: 'NTH', parking: 'indoor', washesPerMonth: 61 })],
  ['vehicle build month 13', vehicles, 'POST', '/x', json({ vin: 'SXPAB1CD9NK000777', buildDate: '2022-13', inServiceDate: '2022-02-01', depotCode: 'NTH', parking: 'indoor', washesPerMonth: 1 })],
  ['vehicle 30 Feb', vehicles, 'POST', '/x', json({ vin: 'SXPAB1CD9NK000777', buildDate: '2022-01', inServiceDate: '2022-02-30', depotCode: 'NTH', parking: 'indoor', washesPerMonth: 1 })],
  ['vehicle unknown depot', vehicles, 'POST', '/x', json({ vin: 'SXPAB1CD9NK000777', buildDate: '2022-01', inServiceDate: '2022-02-01', depotCode: 'ZZZ', parking: 'indoor', washesPerMonth: 1 })],
  ['vehicle duplicate VIN', vehicles, 'POST', '/x', { json: { vin: '__VIN__', buildDate: '2022-01', inServiceDate: '2022-02-01', depotCode: 'NTH', parking: 'indoor', washesPerMonth: 1 } }],
  ['defect bad position', defects, 'POST', '/x', { json: { vin: '__VIN__', position: 'XX', moduleCode: 'WLR-2' } }],
  ['defect bad dtc', defects, 'POST', '/x', { json: { vin: '__VIN__', position: 'FL', moduleCode: 'WLR-2', dtcs: 'B9999' } }],
  ['defect bad module', defects, 'POST', '/x', { json: { vin: '__VIN__', position: 'FL', moduleCode: 'NOPE' } }],
  ['defect bad date', defects, 'POST', '/x', { json: { vin: '__VIN__', position: 'FL', moduleCode: 'WLR-2', reportedAt: '31/12/2024' } }],
  ['defect closed before reported', defects, 'POST', '/x', { json: { vin: '__VIN__', position: 'FL', moduleCode: 'WLR-2', reportedAt: '2024-05-01', closedAt: '2024-04-01' } }],
  ['defect negative odometer', defects, 'POST', '/x', { json: { vin: '__VIN__', position: 'FL', moduleCode: 'WLR-2', odometerKm: -5 } }],
  ['depot rain 400', depots, 'POST', '/x', json({ code: 'ZZ', name: 'Z', coastal: false, rainDaysPerYear: 400, meanRhPct: 50, washBay: false })],
  ['depot rh 101', depots, 'POST', '/x', json({ code: 'ZZ', name: 'Z', coastal: false, rainDaysPerYear: 40, meanRhPct: 101, washBay: false })],
  ['depot coastal maybe', depots, 'POST', '/x', json({ code: 'ZZ', name: 'Z', coastal: 'maybe', rainDaysPerYear: 40, meanRhPct: 50, washBay: false })],
  ['depot bad timezone', depots, 'POST', '/x', json({ code: 'ZZ', name: 'Z', coastal: false, rainDaysPerYear: 40, meanRhPct: 50, washBay: false, timezone: 'Mars/Olympus' })],
  ['depot code with space', depots, 'POST', '/x', json({ code: 'Z Z', name: 'Z', coastal: false, rainDaysPerYear: 40, meanRhPct: 50, washBay: false })],
  ['depot duplicate code', depots, 'POST', '/x', json({ code: 'NTH', name: 'Z', coastal: false, rainDaysPerYear: 40, meanRhPct: 50, washBay: false })],
  ['module bad function', modulesRoute, 'POST', '/x', json({ code: 'M-Z', name: 'Z', function: 'wheel' })],
  ['module duplicate', modulesRoute, 'POST', '/x', json({ code: 'WLR-2', name: 'Z', function: 'other' })],
  ['user bad email', users, 'POST', '/x', json({ email: 'not-an-email', name: 'Z', role: 'viewer', password: 'long password', allDepots: true })],
  ['user bad role', users, 'POST', '/x', json({ email: 'z@example.test', name: 'Z', role: 'wizard', password: 'long password' })],
  ['user short password', users, 'POST', '/x', json({ email: 'z@example.test', name: 'Z', role: 'viewer', password: 'short', allDepots: true })],
  ['user unknown depot', users, 'POST', '/x', json({ email: 'z@example.test', name: 'Z', role: 'technician', password: 'long password', depots: ['NOPE'] })],
  ['user technician without depots', users, 'POST', '/x', json({ email: 'z@example.test', name: 'Z', role: 'technician', password: 'long password' })],
  ['token unknown person', tokens, 'POST', '/x', json({ email: 'nobody@example.test' })],
  // records by path
  ['vehicle path junk', vehicle, 'GET', '/x', { params: { vin: '../../etc' } }],
  ['vehicle unknown', vehicle, 'GET', '/x', { params: { vin: 'SXPAB1CD9NK999999' } }],
  ['vehicle patch bad parking', vehicle, 'PATCH', '/x', { params: { vin: '__VIN__' }, json: { parking: 'roof' } }],
  ['vehicle patch stale version', vehicle, 'PATCH', '/x', { params: { vin: '__VIN__' }, json: { version: 999, make: 'X' } }],
  ['vehicle patch invalid JSON', vehicle, 'PATCH', '/x', { params: { vin: '__VIN__' }, ...raw('{') }],
  ['defect id abc', defect, 'GET', '/x', { params: { id: 'abc' } }],
  ['defect id -1', defect, 'GET', '/x', { params: { id: '-1' } }],
  ['defect id huge', defect, 'GET', '/x', { params: { id: '99999999999999999999999' } }],
  ['defect id 1e3', defect, 'GET', '/x', { params: { id: '1e3' } }],
  ['defect id missing', defect, 'GET', '/x', { params: { id: '424242' } }],
  ['defect patch missing', defect, 'PATCH', '/x', { params: { id: '424242' }, json: { symptom: 'x' } }],
  ['depot unknown', depot, 'GET', '/x', { params: { code: 'NOPE' } }],
  ['depot patch rain', depot, 'PATCH', '/x', { params: { code: 'NTH' }, json: { rainDaysPerYear: -1 } }],
  ['module unknown', moduleRoute, 'GET', '/x', { params: { code: 'NOPE' } }],
  ['module delete unknown', moduleRoute, 'DELETE', '/x', { params: { code: 'NOPE' } }],
  ['user id abc', user, 'PATCH', '/x', { params: { id: 'abc' }, json: {} }],
  ['user patch bad role', user, 'PATCH', '/x', { params: { id: '1' }, json: { role: 'wizard' } }],
  ['token revoke abc', token, 'DELETE', '/x', { params: { id: 'abc' } }],
  ['token revoke missing', token, 'DELETE', '/x', { params: { id: '999999' } }],
  ['wrong method on list', vehicles, 'PUT', '/x', {}],
  ['wrong method on import', importRoute, 'GET', '/x', { params: { kind: 'depots' } }],
  ['import kind unknown', importRoute, 'POST', '/x', { params: { kind: 'wheels' }, ...raw('a\n1', 'text/csv') }],
  ['import multipart without file', importRoute, 'POST', '/x', { params: { kind: 'depots' }, body: (() => { const f = new FormData(); f.set('other', 'x'); return f; })() }],
  ['import not UTF-8', importRoute, 'POST', '/x', { params: { kind: 'depots' }, body: new Uint8Array([0x63, 0x6f, 0x64, 0x65, 0x0a, 0xff, 0xfe, 0x41]), headers: { 'content-type': 'text/csv' } }],
  ['import unclosed quote', importRoute, 'POST', '/x', { params: { kind: 'modules' }, ...raw('code,name,function\n"WLR,x,other\n', 'text/csv') }],
  ['import json type', importRoute, 'POST', '/x', { params: { kind: 'modules' }, ...raw('{"a":1}') }],
];

describe('malformed requests', () => {
  it('has about a hundred cases', () => {
    expect(cases.length).toBeGreaterThanOrEqual(100);
  });
  it.each(cases)('%s → 4xx with the error shape, nothing written', async (_name, route, method, url, opts) => {
    const o = JSON.parse(JSON.stringify({ ...opts, body: undefined }).replaceAll('__VIN__', vin)) as CallOptions;
    const before = snapshot();
    const res = await call(route as never, method, url, { ...o, body: opts.body, token: admin });
    expect(res.status, await res.clone().text()).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
    const b = await res.json();
    expect(typeof b.error.code).toBe('string');
    expect(typeof b.error.message).toBe('string');
    expect(b.error.message.length).toBeGreaterThan(5);
    expect(snapshot()).toBe(before);
  });
});
