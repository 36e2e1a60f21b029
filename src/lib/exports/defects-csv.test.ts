import { describe, expect, it } from 'vitest';
import { readCsv } from '@/lib/imports/csv-read';
import { IMPORT_COLUMNS, validateRows } from '@/lib/imports/rows';
import { buildDefectsCsv, DEFECT_CSV_COLUMNS, DEFECT_CSV_REPORT_COLUMNS, defectsCsvFileName, minorToAmount, partsCell, partsCostMinor, type DefectCsvSource } from './defects-csv';

const closed: DefectCsvSource = {
  ref: 'DF-26-00323',
  vin: 'SH9CA2BD2PK214088',
  reportedAt: '2026-11-06T10:29:00.000Z',
  position: 'FR',
  moduleCode: 'WLR-2',
  symptom: 'window stops half way, then "reverses"',
  dtcs: ['B1A21-29', 'B1A20'],
  moisture: 'corrosion',
  rootCause: 'water_ingress',
  action: 'Replaced motor;\nfitted new membrane',
  odometerKm: 113489,
  closedAt: '2026-11-15T01:36:56.365Z',
  status: 'closed',
  depotCode: 'GHQ',
  fleetNumber: 'LV1016',
  registration: 'GHQ-4941-J',
  repeatOfRef: 'DF-26-00301',
  membraneCondition: 'torn',
  sealCondition: 'ok',
  drainCondition: 'blocked',
  connectorCondition: 'corroded',
  parts: [
    { partNumber: 'CM-WL2-4471', description: 'Window lifter motor, gen 2', quantity: 1, unitCostMinor: 14230 },
    { partNumber: 'MEM-FR', description: null, quantity: 2, unitCostMinor: 1550 },
  ],
  labourMinutes: 95,
  costMinor: 29680,
};
const open: DefectCsvSource = {
  ref: 'DF-26-00342',
  vin: 'SB7LS4CE0ND530131',
  reportedAt: '2026-11-29T13:53:00.000Z',
  position: 'TG',
  moduleCode: 'LCK-1',
  symptom: null,
  dtcs: [],
  moisture: null,
  rootCause: null,
  action: null,
  odometerKm: null,
  closedAt: null,
};

describe('buildDefectsCsv', () => {
  it('starts with exactly the columns of the defects import (CONTRACT.md "Imports"), the report columns after them', () => {
    const all = [...IMPORT_COLUMNS.defects.required, ...IMPORT_COLUMNS.defects.optional].sort();
    expect([...DEFECT_CSV_COLUMNS].sort()).toEqual(all);
    for (const c of DEFECT_CSV_REPORT_COLUMNS) expect(all, c).not.toContain(c);
  });

  it('writes the header, a BOM and CRLF line ends', () => {
    const csv = buildDefectsCsv([open], 'GBP');
    expect(
      csv.startsWith(
        '\uFEFFref,vin,reported_at,position,module_code,symptom,dtcs,moisture,root_cause,action,odometer_km,closed_at,' +
          'status,depot_code,fleet_number,registration,repeat_of,membrane_condition,seal_condition,drain_condition,connector_condition,parts,parts_cost,labour_minutes,cost,currency\r\n',
      ),
    ).toBe(true);
    // No money on the record: no currency either.
    expect(csv.endsWith('DF-26-00342,SB7LS4CE0ND530131,2026-11-29T13:53:00.000Z,TG,LCK-1,,,,,,,,,,,,,,,,,,,,,')).toBe(true);
  });

  it('writes status, depot, findings, parts, labour and cost in major units with the currency', () => {
    const t = readCsv(buildDefectsCsv([closed], 'GBP'));
    const c = t.records[0]!.cells;
    expect([c.status, c.depot_code, c.fleet_number, c.registration, c.repeat_of]).toEqual(['closed', 'GHQ', 'LV1016', 'GHQ-4941-J', 'DF-26-00301']);
    expect([c.membrane_condition, c.seal_condition, c.drain_condition, c.connector_condition]).toEqual(['torn', 'ok', 'blocked', 'corroded']);
    expect(c.parts).toBe('CM-WL2-4471 ×1 (Window lifter motor, gen 2); MEM-FR ×2');
    // 142.30 + 2 × 15.50 = 173.30 (an independent sum of the two lines above).
    expect(c.parts_cost).toBe('173.30');
    expect([c.labour_minutes, c.cost, c.currency]).toEqual(['95', '296.80', 'GBP']);
  });

  it('re-reads through the import reader and validator with the same values and no errors', () => {
    const table = readCsv(buildDefectsCsv([closed, open]));
    const v = validateRows('defects', table);
    expect(v.errors).toEqual([]);
    expect(v.rows).toHaveLength(2);
    const a = v.rows[0]!.value;
    expect(a.ref).toBe('DF-26-00323');
    expect(a.symptom).toBe('window stops half way, then "reverses"');
    expect(a.action).toBe('Replaced motor;\nfitted new membrane');
    expect(a.dtcs.map((d) => d.display)).toEqual(['B1A21-29', 'B1A20']);
    expect(a.reportedAtText).toBe('2026-11-06T10:29:00.000Z');
    expect(a.closedAtText).toBe('2026-11-15T01:36:56.365Z');
    expect(a.odometerKm).toBe(113489);
    const b = v.rows[1]!.value;
    expect([b.symptom, b.moisture, b.rootCause, b.action, b.odometerKm, b.closedAtText]).toEqual([null, null, null, null, null, null]);
    expect(b.dtcs).toEqual([]);
  });

  it('guards cells a spreadsheet would run as formulas, and the import reads them back unchanged (OWASP CSV injection)', () => {
    const risky = { ...open, symptom: '=HYPERLINK("http://example.invalid","click")', action: '-5 turns on the regulator; @check' };
    const csv = buildDefectsCsv([risky]);
    const dataLine = csv.split('\r\n')[1]!;
    expect(dataLine).toContain(`"'=HYPERLINK(""http://example.invalid"",""click"")"`);
    expect(dataLine).toContain(`'-5 turns on the regulator; @check`);
    const v = validateRows('defects', readCsv(csv));
    expect(v.errors).toEqual([]);
    expect(v.rows[0]!.value.symptom).toBe(risky.symptom);
    expect(v.rows[0]!.value.action).toBe(risky.action);
  });

  it('writes only the header for an empty view', () => {
    const table = readCsv(buildDefectsCsv([]));
    expect(table.headers).toEqual([...DEFECT_CSV_COLUMNS, ...DEFECT_CSV_REPORT_COLUMNS]);
    expect(table.records).toEqual([]);
  });

  it('guards a part number or condition note that looks like a formula', () => {
    const csv = buildDefectsCsv([{ ...closed, sealCondition: '+cracked', parts: [{ partNumber: '=1+1', description: null, quantity: 1, unitCostMinor: null }] }], 'EUR');
    const line = csv.split('\r\n')[1]!;
    expect(line).toContain(',"\'+cracked",');
    expect(line).toContain(',"\'=1+1 ×1",');
  });
});

describe('money and parts cells', () => {
  it('writes minor units as a plain amount', () => {
    expect([minorToAmount(29680), minorToAmount(5), minorToAmount(0), minorToAmount(-150), minorToAmount(null)]).toEqual(['296.80', '0.05', '0.00', '-1.50', '']);
  });
  it('sums the costed part lines, or none', () => {
    expect(partsCostMinor([{ partNumber: 'A', description: null, quantity: 3, unitCostMinor: 250 }, { partNumber: 'B', description: null, quantity: 1, unitCostMinor: null }])).toBe(750);
    expect(partsCostMinor([{ partNumber: 'B', description: null, quantity: 1, unitCostMinor: null }])).toBeNull();
    expect(partsCostMinor(undefined)).toBeNull();
    expect(partsCell([])).toBe('');
  });
});

describe('defectsCsvFileName', () => {
  it('names the file by the UTC day', () => {
    expect(defectsCsvFileName(new Date('2026-12-02T23:30:00Z'))).toBe('seepline-defects-2026-12-02.csv');
  });
});
