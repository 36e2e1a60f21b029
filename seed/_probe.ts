import { generateDemoData } from './generate';
import { computePatternsReport } from '../src/lib/patterns/report';
const seeds = process.argv.slice(2).map(Number);
for (const seed of seeds) {
  const d = generateDemoData({ seed });
  const r = computePatternsReport({
    vehicles: d.vehicles.map((v) => ({ id: v.id, vin: v.vin, buildMonth: v.buildMonth, inServiceDate: v.inServiceDate, retiredDate: v.retiredDate ?? null, depotId: v.depotId, parking: v.parking, washesPerMonth: v.washesPerMonth })),
    depots: d.depots.map((x) => ({ id: x.id, code: x.code, coastal: !!x.coastal, rainDaysPerYear: x.rainDaysPerYear, meanRhPct: x.meanRhPct, washBay: !!x.washBay })),
    modules: d.modules.map((m) => ({ id: m.id, code: m.code, function: m.function })),
    failures: d.defects.filter((f) => f.status !== 'cancelled').map((f) => ({ id: f.id, vehicleId: f.vehicleId, moduleId: f.moduleId, reportedAt: new Date(f.reportedAt).toISOString(), moisture: f.moisture ?? null, rootCause: f.rootCause ?? null })),
  }, { asOf: d.today });
  const sig = r.cohorts.filter((c) => c.significant);
  const open = d.defects.filter((f) => !['closed','cancelled'].includes(f.status!)).length;
  console.log(seed, 'defects', d.defects.length, 'open', open, 'offroad', d.vehicles.filter(v=>v.offRoadSinceAt).length, sig.map((c) => `${c.id} RR${c.rateRatio?.toFixed(1)} w=${c.waterIngress}`).join(' | '));
}
if (process.env.DETAIL) {
  const d = generateDemoData({ seed: Number(process.env.DETAIL) });
  const r = computePatternsReport({
    vehicles: d.vehicles.map((v) => ({ id: v.id, vin: v.vin, buildMonth: v.buildMonth, inServiceDate: v.inServiceDate, retiredDate: v.retiredDate ?? null, depotId: v.depotId, parking: v.parking, washesPerMonth: v.washesPerMonth })),
    depots: d.depots.map((x) => ({ id: x.id, code: x.code, coastal: !!x.coastal, rainDaysPerYear: x.rainDaysPerYear, meanRhPct: x.meanRhPct, washBay: !!x.washBay })),
    modules: d.modules.map((m) => ({ id: m.id, code: m.code, function: m.function })),
    failures: d.defects.filter((f) => f.status !== 'cancelled').map((f) => ({ id: f.id, vehicleId: f.vehicleId, moduleId: f.moduleId, reportedAt: new Date(f.reportedAt).toISOString(), moisture: f.moisture ?? null, rootCause: f.rootCause ?? null })),
  }, { asOf: d.today });
  for (const c of r.cohorts.filter((c) => c.moduleCode === 'WLR-2' || c.moduleCode === 'MRM-4')) console.log(c.id, c.vehicles, c.failures, c.expected.toFixed(1), c.rateRatio?.toFixed(2), c.pValue, c.qValue, c.significant, c.bandVehicles);
  console.log(r.bands);
}
