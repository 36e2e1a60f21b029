/**
 * Imports of depots, modules, vehicles and defects (CONTRACT.md "Imports"): parse, validate every row,
 * resolve references, then apply all rows in one transaction — or none when any row is invalid. A dry run
 * applies inside the transaction and rolls it back, so its counts are exactly what a real run would do.
 * The same `apply…Row` functions serve the single-record create and update endpoints.
 */
import { and, eq, inArray } from 'drizzle-orm';
import { getDb, type Db } from '@/db/client';
import { defectCodes, defects, depots, modules, vehicles } from '@/db/schema';
import { CsvFormatError, readCsv } from '@/lib/imports/csv-read';
import {
  validateRows,
  type DefectRow,
  type DepotRow,
  type ImportKind,
  type ModuleRow,
  type RowIssue,
  type VehicleRow,
} from '@/lib/imports/rows';
import { parseInstant } from '@/lib/dates/dates';
import { writeAudit, type Actor } from './audit';
import { refreshRepeats } from './repeats';

export type Outcome = 'inserted' | 'updated' | 'unchanged';
export type ImportResult = {
  kind: ImportKind;
  dryRun: boolean;
  rows: number;
  inserted: number;
  updated: number;
  unchanged: number;
  errors: RowIssue[];
  warnings: RowIssue[];
};

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** Largest import file accepted. */
export const MAX_IMPORT_BYTES = 50 * 1024 * 1024;
/** Most errors listed in one response (the count says how many there were). */
const MAX_LISTED_ERRORS = 1000;

class DryRunRollback extends Error {}

/** Values that differ between an existing row and the new values (only the keys of `next`). */
function changedFields<T extends Record<string, unknown>>(prev: T, next: Partial<T>): Array<keyof T> {
  return (Object.keys(next) as Array<keyof T>).filter((k) => {
    const a = prev[k] ?? null;
    const b = next[k] ?? null;
    return a !== b;
  });
}

function audit(tx: Tx, actor: Actor, entity: string, id: string, outcome: Outcome, prev: Record<string, unknown> | null, next: Record<string, unknown>, fields: string[], action = 'import'): void {
  if (outcome === 'unchanged') return;
  if (outcome === 'inserted') {
    writeAudit(tx, actor, { entity, entityId: id, action: action === 'import' ? 'import:create' : 'create' });
    return;
  }
  for (const f of fields) {
    writeAudit(tx, actor, {
      entity,
      entityId: id,
      action: action === 'import' ? 'import:update' : 'update',
      field: f,
      oldValue: prev?.[f] == null ? null : String(prev[f]),
      newValue: next[f] == null ? null : String(next[f]),
    });
  }
}

/** Insert or update one depot by code. */
export function applyDepotRow(tx: Tx, row: DepotRow, actor: Actor, action = 'import'): { outcome: Outcome; id: number } {
  const values = { ...row };
  const prev = tx.select().from(depots).where(eq(depots.code, row.code)).get();
  if (!prev) {
    const r = tx.insert(depots).values(values).returning({ id: depots.id }).get();
    audit(tx, actor, 'depot', String(r.id), 'inserted', null, values, [], action);
    return { outcome: 'inserted', id: r.id };
  }
  const fields = changedFields(prev, values) as string[];
  if (fields.length === 0) return { outcome: 'unchanged', id: prev.id };
  tx.update(depots).set({ ...values, updatedAt: Date.now() }).where(eq(depots.id, prev.id)).run();
  audit(tx, actor, 'depot', String(prev.id), 'updated', prev, values, fields, action);
  return { outcome: 'updated', id: prev.id };
}

/** Insert or update one module type by code. */
export function applyModuleRow(tx: Tx, row: ModuleRow, actor: Actor, action = 'import'): { outcome: Outcome; id: number } {
  const prev = tx.select().from(modules).where(eq(modules.code, row.code)).get();
  if (!prev) {
    const r = tx.insert(modules).values(row).returning({ id: modules.id }).get();
    audit(tx, actor, 'module', String(r.id), 'inserted', null, row, [], action);
    return { outcome: 'inserted', id: r.id };
  }
  const fields = changedFields(prev, row) as string[];
  if (fields.length === 0) return { outcome: 'unchanged', id: prev.id };
  tx.update(modules).set({ ...row, updatedAt: Date.now() }).where(eq(modules.id, prev.id)).run();
  audit(tx, actor, 'module', String(prev.id), 'updated', prev, row, fields, action);
  return { outcome: 'updated', id: prev.id };
}

/** Insert or update one vehicle by VIN; `depotId` is the resolved depot_code. */
export function applyVehicleRow(tx: Tx, row: VehicleRow, depotId: number, actor: Actor, action = 'import'): { outcome: Outcome; id: number } {
  const { depotCode: _code, ...rest } = row;
  const values = { ...rest, depotId };
  const prev = tx.select().from(vehicles).where(eq(vehicles.vin, row.vin)).get();
  if (!prev) {
    const r = tx.insert(vehicles).values(values).returning({ id: vehicles.id }).get();
    audit(tx, actor, 'vehicle', row.vin, 'inserted', null, values, [], action);
    return { outcome: 'inserted', id: r.id };
  }
  const fields = changedFields(prev, values) as string[];
  if (fields.length === 0) return { outcome: 'unchanged', id: prev.id };
  tx.update(vehicles)
    .set({ ...values, version: prev.version + 1, updatedAt: Date.now() })
    .where(eq(vehicles.id, prev.id))
    .run();
  audit(tx, actor, 'vehicle', row.vin, 'updated', prev, values, fields, action);
  return { outcome: 'updated', id: prev.id };
}

export type DefectRefs = { vehicleId: number; depotId: number; timezone: string | null; moduleId: number };

/** The database values a defect row stands for. */
export function defectValues(row: DefectRow, refs: DefectRefs) {
  const reportedAt = parseInstant(row.reportedAtText, refs.timezone)!;
  const closedAt = row.closedAtText ? parseInstant(row.closedAtText, refs.timezone) : null;
  return {
    vehicleId: refs.vehicleId,
    moduleId: refs.moduleId,
    position: row.position,
    reportedAt,
    reportedAtText: row.reportedAtText,
    symptom: row.symptom,
    dtcs: row.dtcs.length ? row.dtcs.map((d) => d.display).join(' ') : null,
    moisture: row.moisture,
    rootCause: row.rootCause,
    action: row.action,
    odometerKm: row.odometerKm,
    closedAt,
    closedAtText: row.closedAtText,
  };
}

/** Replace a defect's broken-out fault codes. */
export function writeDefectCodes(tx: Tx, defectId: number, dtcs: DefectRow['dtcs']): void {
  tx.delete(defectCodes).where(eq(defectCodes.defectId, defectId)).run();
  if (dtcs.length) {
    tx.insert(defectCodes)
      .values(dtcs.map((d, i) => ({ defectId, seq: i + 1, code: d.code, failureType: d.failureType })))
      .run();
  }
}

/** Generated reference for a defect without one. */
export function defectRef(id: number): string {
  return `DF-${String(id).padStart(6, '0')}`;
}

/** Insert or update one defect: by ref when given, else by (vehicle, reported_at, position, module). */
export function applyDefectRow(tx: Tx, row: DefectRow, refs: DefectRefs, actor: Actor, action = 'import'): { outcome: Outcome; id: number; vehicleId: number } {
  const values = defectValues(row, refs);
  const prev = row.ref
    ? tx.select().from(defects).where(eq(defects.ref, row.ref)).get()
    : tx
        .select()
        .from(defects)
        .where(
          and(
            eq(defects.vehicleId, refs.vehicleId),
            eq(defects.reportedAt, values.reportedAt),
            eq(defects.position, row.position),
            eq(defects.moduleId, refs.moduleId),
          ),
        )
        .get();
  if (!prev) {
    const status = values.closedAt !== null ? 'closed' : 'reported';
    const r = tx
      .insert(defects)
      .values({ ...values, depotId: refs.depotId, status, ref: row.ref ?? `TMP-${crypto.randomUUID()}` })
      .returning({ id: defects.id })
      .get();
    const ref = row.ref ?? defectRef(r.id);
    if (!row.ref) tx.update(defects).set({ ref }).where(eq(defects.id, r.id)).run();
    writeDefectCodes(tx, r.id, row.dtcs);
    audit(tx, actor, 'defect', String(r.id), 'inserted', null, values, [], action);
    return { outcome: 'inserted', id: r.id, vehicleId: refs.vehicleId };
  }
  // reportedAtText/closedAtText only record how a time was written; a change there alone is not a change.
  const { reportedAtText: _a, closedAtText: _b, ...compared } = values;
  const fields = changedFields(prev, compared) as string[];
  if (fields.length === 0) return { outcome: 'unchanged', id: prev.id, vehicleId: prev.vehicleId };
  let status = prev.status;
  if (prev.closedAt === null && values.closedAt !== null && status !== 'cancelled') status = 'closed';
  if (prev.closedAt !== null && values.closedAt === null && status === 'closed') status = 'reported';
  tx.update(defects)
    .set({ ...values, status, version: prev.version + 1, updatedAt: Date.now() })
    .where(eq(defects.id, prev.id))
    .run();
  if (fields.includes('dtcs')) writeDefectCodes(tx, prev.id, row.dtcs);
  audit(tx, actor, 'defect', String(prev.id), 'updated', prev, compared, fields, action);
  return { outcome: 'updated', id: prev.id, vehicleId: prev.vehicleId };
}

function chunked<T>(items: T[], size = 500): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

/** Run an import from CSV text. Never writes anything when `errors` is non-empty. */
export function runImport(kind: ImportKind, text: string, opts: { dryRun: boolean; actor: Actor }): ImportResult {
  const result: ImportResult = { kind, dryRun: opts.dryRun, rows: 0, inserted: 0, updated: 0, unchanged: 0, errors: [], warnings: [] };
  let table;
  try {
    table = readCsv(text);
  } catch (e) {
    if (e instanceof CsvFormatError) {
      result.errors.push({ row: e.row ?? 0, column: '', message: e.message });
      return result;
    }
    throw e;
  }
  result.rows = table.records.length;
  const db = getDb();
  const v = validateRows(kind, table);
  result.errors.push(...v.errors);
  result.warnings.push(...v.warnings);

  // Resolve references against the database.
  const depotByCode = new Map<string, { id: number; timezone: string | null }>();
  const moduleByCode = new Map<string, number>();
  const vehicleByVin = new Map<string, { id: number; depotId: number }>();
  if (kind === 'vehicles') {
    for (const d of db.select({ id: depots.id, code: depots.code, timezone: depots.timezone }).from(depots).all()) depotByCode.set(d.code, d);
    for (const r of v.rows) {
      const row = r.value as VehicleRow;
      if (!depotByCode.has(row.depotCode)) result.errors.push({ row: r.row, column: 'depot_code', message: `No depot with code ${row.depotCode}; import depots first.` });
    }
  }
  if (kind === 'defects') {
    for (const m of db.select({ id: modules.id, code: modules.code }).from(modules).all()) moduleByCode.set(m.code, m.id);
    const vins = [...new Set(v.rows.map((r) => (r.value as DefectRow).vin))];
    for (const part of chunked(vins)) {
      for (const x of db.select({ id: vehicles.id, vin: vehicles.vin, depotId: vehicles.depotId }).from(vehicles).where(inArray(vehicles.vin, part)).all()) {
        vehicleByVin.set(x.vin, x);
      }
    }
    const tz = new Map(db.select({ id: depots.id, timezone: depots.timezone }).from(depots).all().map((d) => [d.id, d.timezone]));
    for (const [, veh] of vehicleByVin) depotByCode.set(`#${veh.depotId}`, { id: veh.depotId, timezone: tz.get(veh.depotId) ?? null });
    for (const r of v.rows) {
      const row = r.value as DefectRow;
      if (!vehicleByVin.has(row.vin)) result.errors.push({ row: r.row, column: 'vin', message: `No vehicle with VIN ${row.vin}; import or add the vehicle first.` });
      if (!moduleByCode.has(row.moduleCode)) result.errors.push({ row: r.row, column: 'module_code', message: `No module type with code ${row.moduleCode} in the catalogue.` });
    }
  }
  if (result.errors.length > 0) {
    result.errors.sort((a, b) => a.row - b.row);
    if (result.errors.length > MAX_LISTED_ERRORS) result.errors = result.errors.slice(0, MAX_LISTED_ERRORS);
    return result;
  }

  const apply = (tx: Tx) => {
    const touchedVehicles = new Set<number>();
    for (const r of v.rows) {
      let out: { outcome: Outcome };
      if (kind === 'depots') out = applyDepotRow(tx, r.value as DepotRow, opts.actor);
      else if (kind === 'modules') out = applyModuleRow(tx, r.value as ModuleRow, opts.actor);
      else if (kind === 'vehicles') {
        const row = r.value as VehicleRow;
        out = applyVehicleRow(tx, row, depotByCode.get(row.depotCode)!.id, opts.actor);
      } else {
        const row = r.value as DefectRow;
        const veh = vehicleByVin.get(row.vin)!;
        const dep = depotByCode.get(`#${veh.depotId}`)!;
        const o = applyDefectRow(tx, row, { vehicleId: veh.id, depotId: veh.depotId, timezone: dep.timezone, moduleId: moduleByCode.get(row.moduleCode)! }, opts.actor);
        if (o.outcome !== 'unchanged') touchedVehicles.add(o.vehicleId);
        out = o;
      }
      result[out.outcome]++;
    }
    if (touchedVehicles.size) refreshRepeats(tx, [...touchedVehicles]);
    if (opts.dryRun) throw new DryRunRollback();
  };
  try {
    db.transaction(apply);
  } catch (e) {
    if (!(e instanceof DryRunRollback)) throw e;
  }
  return result;
}
