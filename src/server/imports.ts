/**
 * Imports of depots, modules, vehicles and defects (CONTRACT.md "Imports"): parse, validate every row,
 * resolve references, then apply all rows in one transaction — or none when any row is invalid. A dry run
 * applies inside the transaction and rolls it back, so its counts are exactly what a real run would do.
 * The same `apply…Row` functions serve the single-record create and update endpoints.
 */
import { eq, inArray } from 'drizzle-orm';
import { getDb, type Db } from '@/db/client';
import { auditLog, defectCodes, defects, depots, modules, vehicles } from '@/db/schema';
import { CsvFormatError, readCsv, type CsvTable } from '@/lib/imports/csv-read';
import {
  recordLabel,
  recordReferences,
  validateRows,
  type DefectRow,
  type DepotRow,
  type ImportKind,
  type ModuleRow,
  type RowIssue,
  type VehicleRow,
} from '@/lib/imports/rows';
import { parseInstant } from '@/lib/dates/dates';
import { vehicleSearchKey } from '@/lib/vehicles/search-key';
import type { Actor } from './audit';
import { refreshRepeats } from './repeats';
import { assignDefectRefs } from './defect-refs';

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
  /**
   * Where each row named by an error or warning sits in the sheet: the file's data rows are numbered from 1
   * (CONTRACT.md), `line` is the spreadsheet line (the header usually being line 1), `record` the row's code, VIN or
   * ref as written. Row 0 is the header.
   */
  issueRows: Array<{ row: number; line: number; record: string | null }>;
};

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/** Largest import file accepted. */
export const MAX_IMPORT_BYTES = 50 * 1024 * 1024;
/** Most errors listed in one response (the count says how many there were). */
const MAX_LISTED_ERRORS = 1000;

class DryRunRollback extends Error {}

/** Values that differ between an existing row and the new values (only the keys of `next`). */
function changedFields<T extends Record<string, unknown>>(prev: T, next: Partial<T>): Array<keyof T> {
  return (Object.keys(next) as Array<keyof T>).filter((k) => (prev[k] ?? null) !== (next[k] ?? null));
}

type AuditRow = typeof auditLog.$inferInsert;

/** Collects audit rows during a batch and writes them in chunks at the end (one insert per 500 rows). */
class AuditBuffer {
  readonly rows: AuditRow[] = [];
  constructor(
    private readonly actor: Actor,
    private readonly viaImport: boolean,
    private readonly at = Date.now(),
  ) {}
  private base(entity: string, entityId: string) {
    const a = this.actor;
    return { at: this.at, userId: 'userId' in a ? a.userId : null, actor: 'system' in a ? a.system : null, entity, entityId };
  }
  created(entity: string, entityId: string): void {
    this.rows.push({ ...this.base(entity, entityId), action: this.viaImport ? 'import:create' : 'create' });
  }
  updated(entity: string, entityId: string, prev: Record<string, unknown>, next: Record<string, unknown>, fields: string[]): void {
    for (const f of fields) {
      this.rows.push({
        ...this.base(entity, entityId),
        action: this.viaImport ? 'import:update' : 'update',
        field: f,
        oldValue: prev[f] == null ? null : String(prev[f]),
        newValue: next[f] == null ? null : String(next[f]),
      });
    }
  }
  flush(tx: Tx): void {
    for (const part of chunked(this.rows, 500)) tx.insert(auditLog).values(part).run();
    this.rows.length = 0;
  }
}

type Keyed<V> = { key: string; values: V };

/**
 * Upsert rows of a table with a unique text key: existing rows are loaded in chunks, unchanged ones skipped,
 * changed ones updated one by one, new ones inserted in chunks. Returns each row's outcome and id, in order.
 */
function upsertByKey<V extends Record<string, unknown>>(
  tx: Tx,
  table: typeof depots | typeof modules | typeof vehicles,
  keyColumn: 'code' | 'vin',
  entity: string,
  rows: Keyed<V>[],
  audit: AuditBuffer,
  bumpVersion: boolean,
): Array<{ outcome: Outcome; id: number }> {
  const col = (table as typeof vehicles & typeof depots)[keyColumn as 'vin'];
  const existing = new Map<string, Record<string, unknown> & { id: number }>();
  for (const part of chunked(rows.map((r) => r.key), 500)) {
    for (const row of tx.select().from(table).where(inArray(col, part)).all() as Array<Record<string, unknown> & { id: number }>) {
      existing.set(String(row[keyColumn]), row);
    }
  }
  const out: Array<{ outcome: Outcome; id: number }> = new Array(rows.length);
  const inserts: Array<{ i: number; r: Keyed<V> }> = [];
  rows.forEach((r, i) => {
    const prev = existing.get(r.key);
    if (!prev) {
      inserts.push({ i, r });
      return;
    }
    const fields = changedFields(prev, r.values) as string[];
    if (fields.length === 0) {
      out[i] = { outcome: 'unchanged', id: prev.id };
      return;
    }
    const set: Record<string, unknown> = { ...r.values, updatedAt: Date.now() };
    if (bumpVersion) set.version = Number(prev.version ?? 1) + 1;
    tx.update(table).set(set).where(eq((table as typeof vehicles).id, prev.id)).run();
    // The search key follows the registration and fleet number; it is not a change of its own in the audit trail.
    audit.updated(entity, entity === 'vehicle' ? r.key : String(prev.id), prev, r.values, fields.filter((f) => f !== 'searchKey'));
    out[i] = { outcome: 'updated', id: prev.id };
  });
  for (const part of chunked(inserts, 200)) {
    const ids = tx
      .insert(table)
      .values(part.map((p) => p.r.values) as never)
      .returning({ id: (table as typeof vehicles).id })
      .all();
    part.forEach((p, j) => {
      const id = ids[j]!.id;
      out[p.i] = { outcome: 'inserted', id };
      audit.created(entity, entity === 'vehicle' ? p.r.key : String(id));
    });
  }
  return out;
}

/** Apply depot rows (by code). */
export function applyDepotRows(tx: Tx, rows: DepotRow[], audit: AuditBuffer) {
  return upsertByKey(tx, depots, 'code', 'depot', rows.map((r) => ({ key: r.code, values: { ...r } })), audit, false);
}

/** Apply module rows (by code). */
export function applyModuleRows(tx: Tx, rows: ModuleRow[], audit: AuditBuffer) {
  return upsertByKey(tx, modules, 'code', 'module', rows.map((r) => ({ key: r.code, values: { ...r } })), audit, false);
}

/** Apply vehicle rows (by VIN) with their resolved depot ids. */
export function applyVehicleRows(tx: Tx, rows: Array<{ row: VehicleRow; depotId: number }>, audit: AuditBuffer) {
  return upsertByKey(
    tx,
    vehicles,
    'vin',
    'vehicle',
    rows.map(({ row, depotId }) => {
      const { depotCode: _code, ...rest } = row;
      return { key: row.vin, values: { ...rest, depotId, searchKey: vehicleSearchKey(row.registration, row.fleetNumber) } };
    }),
    audit,
    true,
  );
}

/** Insert or update one depot by code. */
export function applyDepotRow(tx: Tx, row: DepotRow, actor: Actor, action = 'import'): { outcome: Outcome; id: number } {
  const audit = new AuditBuffer(actor, action === 'import');
  const r = applyDepotRows(tx, [row], audit)[0]!;
  audit.flush(tx);
  return r;
}

/** Insert or update one module type by code. */
export function applyModuleRow(tx: Tx, row: ModuleRow, actor: Actor, action = 'import'): { outcome: Outcome; id: number } {
  const audit = new AuditBuffer(actor, action === 'import');
  const r = applyModuleRows(tx, [row], audit)[0]!;
  audit.flush(tx);
  return r;
}

/** Insert or update one vehicle by VIN; `depotId` is the resolved depot_code. */
export function applyVehicleRow(tx: Tx, row: VehicleRow, depotId: number, actor: Actor, action = 'import'): { outcome: Outcome; id: number } {
  const audit = new AuditBuffer(actor, action === 'import');
  const r = applyVehicleRows(tx, [{ row, depotId }], audit)[0]!;
  audit.flush(tx);
  return r;
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

const naturalKey = (vehicleId: number, reportedAt: number, position: string, moduleId: number) => `${vehicleId}|${reportedAt}|${position}|${moduleId}`;

/** Apply defect rows: by ref when given, else by (vehicle, reported_at, position, module). */
export function applyDefectRows(tx: Tx, rows: Array<{ row: DefectRow; refs: DefectRefs }>, audit: AuditBuffer): Array<{ outcome: Outcome; id: number; vehicleId: number }> {
  type Prev = typeof defects.$inferSelect;
  const byRef = new Map<string, Prev>();
  const byKey = new Map<string, Prev>();
  for (const part of chunked([...new Set(rows.map((r) => r.row.ref).filter((x): x is string => !!x))], 500)) {
    for (const d of tx.select().from(defects).where(inArray(defects.ref, part)).all()) byRef.set(d.ref, d);
  }
  for (const part of chunked([...new Set(rows.filter((r) => !r.row.ref).map((r) => r.refs.vehicleId))], 500)) {
    for (const d of tx.select().from(defects).where(inArray(defects.vehicleId, part)).all()) {
      byKey.set(naturalKey(d.vehicleId, d.reportedAt, d.position, d.moduleId), d);
    }
  }
  const out: Array<{ outcome: Outcome; id: number; vehicleId: number }> = new Array(rows.length);
  const inserts: Array<{ i: number; values: ReturnType<typeof defectValues>; row: DefectRow; refs: DefectRefs }> = [];
  rows.forEach(({ row, refs }, i) => {
    const values = defectValues(row, refs);
    const prev = row.ref ? byRef.get(row.ref) : byKey.get(naturalKey(refs.vehicleId, values.reportedAt, row.position, refs.moduleId));
    if (!prev) {
      inserts.push({ i, values, row, refs });
      return;
    }
    // reportedAtText/closedAtText only record how a time was written; a change there alone is not a change.
    const { reportedAtText: _a, closedAtText: _b, ...compared } = values;
    const fields = changedFields(prev, compared) as string[];
    if (fields.length === 0) {
      out[i] = { outcome: 'unchanged', id: prev.id, vehicleId: prev.vehicleId };
      return;
    }
    let status = prev.status;
    if (prev.closedAt === null && values.closedAt !== null && status !== 'cancelled') status = 'closed';
    if (prev.closedAt !== null && values.closedAt === null && status === 'closed') status = 'reported';
    tx.update(defects)
      .set({ ...values, status, version: prev.version + 1, updatedAt: Date.now() })
      .where(eq(defects.id, prev.id))
      .run();
    if (fields.includes('dtcs')) writeDefectCodes(tx, prev.id, row.dtcs);
    audit.updated('defect', String(prev.id), prev, compared, fields);
    out[i] = { outcome: 'updated', id: prev.id, vehicleId: prev.vehicleId };
  });
  for (const part of chunked(inserts, 200)) {
    const ids = tx
      .insert(defects)
      .values(
        part.map((p) => ({
          ...p.values,
          depotId: p.refs.depotId,
          status: p.values.closedAt !== null ? ('closed' as const) : ('reported' as const),
          ref: p.row.ref ?? `TMP-${crypto.randomUUID()}`,
        })),
      )
      .returning({ id: defects.id })
      .all();
    const codes: Array<typeof defectCodes.$inferInsert> = [];
    part.forEach((p, j) => {
      const id = ids[j]!.id;
      out[p.i] = { outcome: 'inserted', id, vehicleId: p.refs.vehicleId };
      p.row.dtcs.forEach((d, k) => codes.push({ defectId: id, seq: k + 1, code: d.code, failureType: d.failureType }));
      audit.created('defect', String(id));
    });
    for (const c of chunked(codes, 500)) tx.insert(defectCodes).values(c).run();
  }
  // Rows without a ref are numbered DF-YY-NNNNN by report year, after every ref of the batch is stored.
  assignDefectRefs(
    tx,
    inserts.filter((p) => !p.row.ref).map((p) => ({ id: out[p.i]!.id, reportedAt: p.values.reportedAt })),
  );
  return out;
}

/** Insert or update one defect. */
export function applyDefectRow(tx: Tx, row: DefectRow, refs: DefectRefs, actor: Actor, action = 'import'): { outcome: Outcome; id: number; vehicleId: number } {
  const audit = new AuditBuffer(actor, action === 'import');
  const r = applyDefectRows(tx, [{ row, refs }], audit)[0]!;
  audit.flush(tx);
  return r;
}

function chunked<T>(items: T[], size = 500): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

/** Run an import from CSV text. Never writes anything when `errors` is non-empty. */
export function runImport(kind: ImportKind, text: string, opts: { dryRun: boolean; actor: Actor }): ImportResult {
  const result: ImportResult = { kind, dryRun: opts.dryRun, rows: 0, inserted: 0, updated: 0, unchanged: 0, errors: [], warnings: [], issueRows: [] };
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

  // Resolve references against the database, for every row (valid or not), so that an unknown VIN, depot or
  // module type is reported in the same pass as the field problems.
  const depotByCode = new Map<string, { id: number; timezone: string | null }>();
  const moduleByCode = new Map<string, number>();
  const vehicleByVin = new Map<string, { id: number; depotId: number }>();
  const refs = v.errors.some((e) => e.row === 0) ? [] : recordReferences(kind, table);
  if (kind === 'vehicles') {
    for (const d of db.select({ id: depots.id, code: depots.code, timezone: depots.timezone }).from(depots).all()) depotByCode.set(d.code, d);
    for (const r of refs) {
      if (!depotByCode.has(r.value)) result.errors.push({ row: r.row, column: 'depot_code', message: `No depot with code ${r.value}; import depots first.` });
    }
  }
  if (kind === 'defects') {
    for (const m of db.select({ id: modules.id, code: modules.code }).from(modules).all()) moduleByCode.set(m.code, m.id);
    const vins = [...new Set(refs.filter((r) => r.column === 'vin').map((r) => r.value))];
    for (const part of chunked(vins)) {
      for (const x of db.select({ id: vehicles.id, vin: vehicles.vin, depotId: vehicles.depotId }).from(vehicles).where(inArray(vehicles.vin, part)).all()) {
        vehicleByVin.set(x.vin, x);
      }
    }
    const tz = new Map(db.select({ id: depots.id, timezone: depots.timezone }).from(depots).all().map((d) => [d.id, d.timezone]));
    for (const [, veh] of vehicleByVin) depotByCode.set(`#${veh.depotId}`, { id: veh.depotId, timezone: tz.get(veh.depotId) ?? null });
    for (const r of refs) {
      if (r.column === 'vin' && !vehicleByVin.has(r.value)) result.errors.push({ row: r.row, column: 'vin', message: `No vehicle with VIN ${r.value}; import or add the vehicle first.` });
      if (r.column === 'module_code' && !moduleByCode.has(r.value)) result.errors.push({ row: r.row, column: 'module_code', message: `No module type with code ${r.value} in the catalogue.` });
    }
  }
  if (result.errors.length > 0) {
    // Stable: within a row, the field problems come first, then the references.
    result.errors.sort((a, b) => a.row - b.row);
    if (result.errors.length > MAX_LISTED_ERRORS) result.errors = result.errors.slice(0, MAX_LISTED_ERRORS);
    result.issueRows = issueRows(kind, table, result);
    return result;
  }

  const apply = (tx: Tx) => {
    const audit = new AuditBuffer(opts.actor, true);
    let outcomes: Array<{ outcome: Outcome }>;
    if (kind === 'depots') outcomes = applyDepotRows(tx, v.rows.map((r) => r.value as DepotRow), audit);
    else if (kind === 'modules') outcomes = applyModuleRows(tx, v.rows.map((r) => r.value as ModuleRow), audit);
    else if (kind === 'vehicles') {
      outcomes = applyVehicleRows(
        tx,
        v.rows.map((r) => ({ row: r.value as VehicleRow, depotId: depotByCode.get((r.value as VehicleRow).depotCode)!.id })),
        audit,
      );
    } else {
      const list = v.rows.map((r) => {
        const row = r.value as DefectRow;
        const veh = vehicleByVin.get(row.vin)!;
        const dep = depotByCode.get(`#${veh.depotId}`)!;
        return { row, refs: { vehicleId: veh.id, depotId: veh.depotId, timezone: dep.timezone, moduleId: moduleByCode.get(row.moduleCode)! } };
      });
      const out = applyDefectRows(tx, list, audit);
      const touched = [...new Set(out.filter((o) => o.outcome !== 'unchanged').map((o) => o.vehicleId))];
      if (touched.length) refreshRepeats(tx, touched);
      outcomes = out;
    }
    for (const o of outcomes) result[o.outcome]++;
    audit.flush(tx);
    if (opts.dryRun) throw new DryRunRollback();
  };
  try {
    db.transaction(apply);
  } catch (e) {
    if (!(e instanceof DryRunRollback)) throw e;
  }
  result.issueRows = issueRows(kind, table, result);
  return result;
}

/** The spreadsheet line and identity of every row an error or warning names (see ImportResult.issueRows). */
function issueRows(kind: ImportKind, table: CsvTable, result: Pick<ImportResult, 'errors' | 'warnings'>): ImportResult['issueRows'] {
  const named = new Set([...result.errors, ...result.warnings].map((i) => i.row));
  const out: ImportResult['issueRows'] = [];
  if (named.has(0)) out.push({ row: 0, line: table.headerLine, record: null });
  for (const rec of table.records) if (named.has(rec.row)) out.push({ row: rec.row, line: rec.line, record: recordLabel(kind, rec.cells) });
  return out;
}
