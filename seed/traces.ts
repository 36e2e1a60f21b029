/**
 * Demo scope captures: a few hall-sensor traces generated from known parameters (src/lib/traces/generate.ts)
 * and stored on suitable demo defects, the files written to UPLOAD_DIR as an upload would write them. Called
 * once by seedDemo after the main insert. Deterministic: the same demo data gives the same defects, files,
 * analyses and times. Edit when the demo should show another kind of trace.
 *
 * The story: on the most recent water-ingress window-lifter repair at Gullhaven Quay the technician captured
 * the two hall channels shorted together before the repair and a healthy pair after it; another GHQ window
 * lifter has a channel stuck high; an open GHQ defect shows glitches and a missing pulse; at Saltmere Point a
 * corroded connector gives a weak high level.
 */
import { sql } from 'drizzle-orm';
import type { Db } from '../src/db/client';
import * as schema from '../src/db/schema';
import { captureToCsv, generateCapture, type CsvVariant, type GenerateSpec } from '../src/lib/traces/generate';
import type { Verdict } from '../src/lib/traces/verdict';
import { analyzeBytes, writeCaptureFile, type StoredAnalysis } from '../src/server/traces/store';
import { writeAudit } from '../src/server/audit';

const HOUR_MS = 3_600_000;

/** Which demo defect a capture goes on. */
interface DefectPick {
  depot: string;
  modules: string[];
  /** Extra SQL condition on the defect (alias d). */
  where: string;
}

/** One demo capture: what to generate, how to write it, and the verdict it must get. */
export interface DemoTrace {
  key: string;
  /** File name; `{door}` becomes the defect's door position (FL, FR, ...). */
  fileName: string;
  pick: DefectPick | { sameAs: string };
  /** Hours after the defect was reported (or, with `afterRepair`, before it was verified or closed). */
  hours: number;
  afterRepair?: boolean;
  spec: GenerateSpec;
  variant: CsvVariant;
  pulsesPerRev?: number;
  supplyV?: number;
  verdict: Verdict;
}

const WINDOW_LIFTERS = ['WLR-2', 'WLR-3'];

/** The demo captures (exported for the test that checks each gets its verdict). */
export const DEMO_TRACES: DemoTrace[] = [
  {
    key: 'water-before',
    fileName: '{door}-hall-before-repair.csv',
    pick: { depot: 'GHQ', modules: ['WLR-2'], where: `d.root_cause = 'water_ingress' and d.status in ('repaired', 'verified', 'closed')` },
    hours: 3,
    spec: { freqHz: 152, sampleRateHz: 100_000, samples: 24_000, phaseDeg: 90, dutyPct: 50, lowV: 0.15, highV: 4.92, noiseV: 0.04, bridged: 'wired-and', spikeV: 1.6, seed: 401 },
    variant: { preamble: ['Window motor, hall channels at the door harness connector', 'Probe A: hall 1, Probe B: hall 2'], timeUnit: 'ms' },
    verdict: 'channels_shorted',
  },
  {
    key: 'water-after',
    fileName: '{door}-hall-after-repair.csv',
    pick: { sameAs: 'water-before' },
    hours: 1,
    afterRepair: true,
    spec: { freqHz: 176, endFreqHz: 162, sampleRateHz: 100_000, samples: 24_000, phaseDeg: 88, dutyPct: 50, lowV: 0.12, highV: 4.95, noiseV: 0.03, seed: 402 },
    variant: { delimiter: ';', decimalComma: true, timeUnit: 'ms' },
    pulsesPerRev: 2,
    verdict: 'healthy',
  },
  {
    key: 'stuck',
    fileName: '{door}-hall-B-flat.csv',
    pick: { depot: 'GHQ', modules: WINDOW_LIFTERS, where: `d.root_cause in ('sensor', 'water_ingress')` },
    hours: 5,
    spec: { freqHz: 168, sampleRateHz: 50_000, samples: 12_000, phaseDeg: 90, lowV: 0.18, highV: 4.9, noiseV: 0.03, b: { stuck: 'high' }, seed: 403 },
    variant: { delimiter: '\t', timeUnit: 'us', millivolts: true },
    verdict: 'channel_stuck',
  },
  {
    key: 'glitches',
    fileName: '{door}-hall-intermittent.csv',
    pick: { depot: 'GHQ', modules: WINDOW_LIFTERS, where: `d.status in ('diagnosing', 'awaiting_parts')` },
    hours: 20,
    spec: { freqHz: 140, sampleRateHz: 100_000, samples: 30_000, phaseDeg: -92, lowV: 0.2, highV: 4.88, noiseV: 0.04, a: { glitches: 3 }, b: { dropouts: 1 }, seed: 404 },
    variant: { header: 'bracket', timeUnit: 'ms' },
    verdict: 'intermittent',
  },
  {
    key: 'weak',
    fileName: '{door}-hall-weak-B.csv',
    pick: { depot: 'SMP', modules: WINDOW_LIFTERS, where: `d.moisture in ('corrosion', 'traces')` },
    hours: 8,
    spec: { freqHz: 160, sampleRateHz: 80_000, samples: 16_000, phaseDeg: 95, lowV: 0.2, highV: 4.9, noiseV: 0.03, b: { highV: 2.55, lowV: 0.35 }, seed: 405 },
    variant: { crlf: true, bom: true },
    supplyV: 5,
    verdict: 'low_amplitude',
  },
];

/** The capture file text of a demo trace. */
export function demoTraceCsv(t: DemoTrace): string {
  return captureToCsv(generateCapture(t.spec), t.variant);
}

type PickedDefect = {
  id: number;
  depot_id: number;
  reported_at: number;
  verified_at: number | null;
  closed_at: number | null;
  assigned_to_id: number | null;
  position: string;
};

/** The most recent defect matching a pick that no earlier capture took. */
function pickDefect(db: Db, p: DefectPick, taken: number[]): PickedDefect | undefined {
  const modules = sql.join(p.modules.map((m) => sql`${m}`), sql`, `);
  const notTaken = taken.length ? sql`and d.id not in (${sql.join(taken.map((id) => sql`${id}`), sql`, `)})` : sql``;
  return db.get<PickedDefect | undefined>(sql`
    select d.id, d.depot_id, d.reported_at, d.verified_at, d.closed_at, d.assigned_to_id, d.position
    from defects d join modules m on m.id = d.module_id join depots p on p.id = d.depot_id
    where p.code = ${p.depot} and m.code in (${modules}) and ${sql.raw(p.where)} ${notTaken}
    order by d.reported_at desc, d.id desc limit 1`);
}

/** Store the demo captures on their defects; returns how many were stored. */
export function seedTraces(db: Db): number {
  const picked = new Map<string, PickedDefect>();
  const rows: Array<{ t: DemoTrace; d: PickedDefect; bytes: Uint8Array; analysis: StoredAnalysis; at: number; fileName: string }> = [];
  for (const t of DEMO_TRACES) {
    const d = 'sameAs' in t.pick ? picked.get(t.pick.sameAs) : pickDefect(db, t.pick, [...picked.values()].map((x) => x.id));
    if (!d) continue; // a demo variant without such a defect simply has fewer traces
    picked.set(t.key, d);
    const bytes = new TextEncoder().encode(demoTraceCsv(t));
    const analysis = { ...analyzeBytes(bytes, { pulsesPerRev: t.pulsesPerRev, supplyV: t.supplyV }), pulsesPerRev: t.pulsesPerRev ?? null };
    if (analysis.verdict !== t.verdict) throw new Error(`demo trace ${t.key}: expected ${t.verdict}, measured ${analysis.verdict}`);
    const end = t.afterRepair ? (d.verified_at ?? d.closed_at) : null;
    const at = end !== null ? end - t.hours * HOUR_MS : d.reported_at + t.hours * HOUR_MS;
    rows.push({ t, d, bytes, analysis, at, fileName: t.fileName.replace('{door}', d.position) });
  }
  const files = rows.map((r) => writeCaptureFile(r.bytes));
  db.transaction((tx) => {
    rows.forEach((r, i) => {
      const f = files[i]!;
      tx.insert(schema.attachments)
        .values({
          defectId: r.d.id,
          depotId: r.d.depot_id,
          kind: 'trace',
          sha256: f.sha256,
          mime: 'text/csv',
          bytes: r.bytes.byteLength,
          originalName: r.fileName,
          storedPath: f.storedPath,
          analysis: JSON.stringify(r.analysis),
          createdById: r.d.assigned_to_id,
          createdAt: r.at,
        })
        .run();
      writeAudit(tx, r.d.assigned_to_id ? { userId: r.d.assigned_to_id } : { system: 'seed' }, { entity: 'defect', entityId: String(r.d.id), action: 'trace:add', newValue: `${r.analysis.verdict} (${r.fileName})` }, r.at);
    });
  });
  return rows.length;
}
