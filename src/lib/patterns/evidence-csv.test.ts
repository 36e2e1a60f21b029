import { describe, expect, it } from 'vitest';
import { buildEvidenceCsv, EVIDENCE_CSV_COLUMNS, evidenceCsvFileName, type EvidenceDefect, type EvidenceVehicle } from './evidence-csv';

const pattern = { id: 12, moduleCode: 'WLR-2', exposureBand: 'high', buildFrom: '2022-10', buildTo: '2023-03', asOf: '2026-11-30' };
const vehicle = (id: number, over: Partial<EvidenceVehicle> = {}): EvidenceVehicle => ({
  id,
  vin: `VIN${id}`,
  fleetNumber: `F${id}`,
  registration: null,
  make: 'Halvenn',
  model: 'Carrio',
  buildMonth: '2022-11',
  inServiceDate: '2023-01-10',
  retiredDate: null,
  depotCode: 'GHQ',
  parking: 'outdoor',
  washesPerMonth: 4,
  exposureIndex: 9,
  failures: 0,
  repeat: false,
  ...over,
});
const defect = (vehicleId: number, ref: string, over: Partial<EvidenceDefect> = {}): EvidenceDefect => ({
  ref,
  vehicleId,
  reportedAt: '2024-02-01T08:00:00.000Z',
  position: 'FL',
  status: 'closed',
  symptom: 'No auto up',
  dtcs: ['B1A21-29', 'B1A22-29'],
  moisture: 'corrosion',
  rootCause: 'water_ingress',
  diagnosed: true,
  wet: true,
  conditions: { membrane: 'torn', seal: null, drain: 'blocked', connector: 'corroded' },
  action: 'Replaced motor',
  closedAt: '2024-02-03T12:00:00.000Z',
  traces: [],
  ...over,
});

describe('evidence CSV', () => {
  const csv = buildEvidenceCsv(
    pattern,
    [vehicle(1, { failures: 2, repeat: true }), vehicle(2)],
    [
      defect(1, 'D-1', { traces: [{ verdict: 'channel_stuck' }, { verdict: 'healthy' }] }),
      defect(1, 'D-2', { moisture: 'none', rootCause: 'mechanical', wet: false, symptom: '=HYPERLINK("x")', dtcs: [] }),
    ],
  );
  const lines = csv.split('\r\n');

  it('starts with a byte-order mark and the documented header', () => {
    expect(csv.startsWith('\uFEFF')).toBe(true);
    expect(lines[0]).toBe('\uFEFF' + EVIDENCE_CSV_COLUMNS.map((c) => c[0]).join(','));
    expect(EVIDENCE_CSV_COLUMNS).toHaveLength(36);
  });

  it('writes one row per failure and one per vehicle without a failure', () => {
    expect(lines).toHaveLength(4);
    expect(lines[1]).toBe(
      '12,WLR-2,high,2022-10,2023-03,2026-11-30,VIN1,F1,,Halvenn,Carrio,2022-11,2023-01-10,,GHQ,outdoor,4,9,2,yes,' +
        'D-1,2024-02-01T08:00:00.000Z,FL,closed,No auto up,B1A21-29 B1A22-29,corrosion,water_ingress,yes,torn,,blocked,corroded,' +
        'Replaced motor,2024-02-03T12:00:00.000Z,channel_stuck; healthy',
    );
    expect(lines[3]).toBe('12,WLR-2,high,2022-10,2023-03,2026-11-30,VIN2,F2,,Halvenn,Carrio,2022-11,2023-01-10,,GHQ,outdoor,4,9,0,no' + ','.repeat(16));
  });

  it('defuses formulas and quotes cells that need it', () => {
    expect(lines[2]).toContain(`,"'=HYPERLINK(""x"")",,none,mechanical,no,`);
  });

  it('marks undiagnosed failures', () => {
    const one = buildEvidenceCsv(pattern, [vehicle(3, { failures: 1 })], [defect(3, 'D-3', { diagnosed: false, wet: false, moisture: null, rootCause: null })]);
    expect(one.split('\r\n')[1]).toContain(',D-3,');
    expect(one.split('\r\n')[1]).toContain(',,,not_diagnosed,');
  });

  it('names the file after the pattern', () => {
    expect(evidenceCsvFileName(pattern)).toBe('seepline-pattern-12-WLR-2-high-2022-10-2023-03.csv');
  });
});
