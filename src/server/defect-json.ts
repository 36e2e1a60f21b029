/**
 * The JSON of a defect as lists show it (and the common part of one record): the columns it is read from, with
 * the vehicle, depot, module and the earlier defect a repeat links to.
 */
import { alias } from 'drizzle-orm/sqlite-core';
import { defects, depots, modules, vehicles } from '@/db/schema';
import { OPEN_STATUS_VALUES } from '@/lib/defects/transitions';
import { iso } from './list-helpers';

/** The earlier defect a repeat links to. */
export const earlier = alias(defects, 'earlier');

/** The columns every defect JSON is built from. */
export const defectSelect = {
  d: defects,
  vin: vehicles.vin,
  fleetNumber: vehicles.fleetNumber,
  registration: vehicles.registration,
  make: vehicles.make,
  model: vehicles.model,
  depotCode: depots.code,
  moduleCode: modules.code,
  moduleName: modules.name,
  moduleFunction: modules.function,
  repeatOfRef: earlier.ref,
};
export type DefectSel = {
  d: typeof defects.$inferSelect;
  vin: string;
  fleetNumber: string | null;
  registration: string | null;
  make: string | null;
  model: string | null;
  depotCode: string;
  moduleCode: string;
  moduleName: string;
  moduleFunction: string;
  repeatOfRef: string | null;
};

/** JSON of a defect in lists. */
export function defectJson(r: DefectSel) {
  const d = r.d;
  return {
    id: d.id,
    ref: d.ref,
    vin: r.vin,
    vehicleId: d.vehicleId,
    fleetNumber: r.fleetNumber,
    registration: r.registration,
    make: r.make,
    model: r.model,
    depotCode: r.depotCode,
    moduleCode: r.moduleCode,
    moduleName: r.moduleName,
    moduleFunction: r.moduleFunction,
    position: d.position,
    status: d.status,
    open: OPEN_STATUS_VALUES.includes(d.status),
    reportedAt: iso(d.reportedAt)!,
    symptom: d.symptom,
    dtcs: d.dtcs ? d.dtcs.split(' ') : [],
    moisture: d.moisture,
    rootCause: d.rootCause,
    action: d.action,
    odometerKm: d.odometerKm,
    labourMinutes: d.labourMinutes,
    costMinor: d.costMinor,
    closedAt: iso(d.closedAt),
    repeat: d.repeatOfId !== null,
    repeatOfId: d.repeatOfId,
    repeatOfRef: r.repeatOfRef,
    version: d.version,
    createdAt: iso(d.createdAt),
    updatedAt: iso(d.updatedAt),
  };
}
export type DefectJson = ReturnType<typeof defectJson>;
