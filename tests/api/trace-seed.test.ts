// The demo scope captures: each generated capture gets the verdict it is meant to show, and seeding the demo
// stores them on matching defects with their files under UPLOAD_DIR.
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { DEMO_TRACES, demoTraceCsv } from '../../seed/traces';
import { seedDemo } from '../../seed/demo';
import { getDb } from '../../src/db/client';
import { analyzeCapture } from '../../src/lib/traces/analyze';
import { parseCapture } from '../../src/lib/traces/capture-parse';
import { listTraces } from '../../src/server/traces/store';

describe('demo traces', () => {
  it.each(DEMO_TRACES.map((t) => [t.key, t] as const))('%s is measured as its intended verdict', (_key, t) => {
    const r = analyzeCapture(parseCapture(new TextEncoder().encode(demoTraceCsv(t))), { pulsesPerRev: t.pulsesPerRev, supplyV: t.supplyV });
    expect(r.verdict).toBe(t.verdict);
  });

  it('are stored on matching demo defects by seedDemo, with their files under UPLOAD_DIR', async () => {
    await seedDemo(getDb());
    const all = listTraces({ id: 0, email: 'test@example.test', name: 'Test', role: 'admin', depotIds: null, via: 'token' }, { page: 1, pageSize: 50 });
    expect(all.total).toBe(DEMO_TRACES.length);
    const byName = new Map(all.items.map((t) => [t.fileName!.replace(/^[A-Z]{2}-/, '{door}-'), t]));
    for (const t of DEMO_TRACES) {
      const stored = byName.get(t.fileName)!;
      expect(stored, t.key).toBeDefined();
      expect(stored.verdict).toBe(t.verdict);
      expect(stored.defectRef).toMatch(/^DF-/);
      expect(stored.createdBy).not.toBeNull();
    }
    const before = byName.get('{door}-hall-before-repair.csv')!;
    const after = byName.get('{door}-hall-after-repair.csv')!;
    expect(after.defectId).toBe(before.defectId);
    expect(before.depotCode).toBe('GHQ');
    expect(Date.parse(after.createdAt!)).toBeGreaterThan(Date.parse(before.createdAt!));
    expect(byName.get('{door}-hall-weak-B.csv')!.depotCode).toBe('SMP');
    const files = fs.readdirSync(path.join(process.env.UPLOAD_DIR!, 'traces'), { recursive: true }).filter((f) => String(f).endsWith('.csv'));
    expect(files).toHaveLength(DEMO_TRACES.length);
  });
});
