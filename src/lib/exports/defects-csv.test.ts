import { describe, expect, it } from 'vitest';
import { readCsv } from '@/lib/imports/csv-read';
import { IMPORT_COLUMNS, validateRows } from '@/lib/imports/rows';
import { buildDefectsCsv, DEFECT_CSV_COLUMNS, defectsCsvFileName, type DefectCsvSource } from './defects-csv';

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
  it('uses exactly the columns of the defects import (CONTRACT.md "Imports")', () => {
    const all = [...IMPORT_COLUMNS.defects.required, ...IMPORT_COLUMNS.defects.optional].sort();
    expect([...DEFECT_CSV_COLUMNS].sort()).toEqual(all);
  });

  it('writes the header, a BOM and CRLF line ends', () => {
    const csv = buildDefectsCsv([open]);
    expect(csv.startsWith('\uFEFFref,vin,reported_at,position,module_code,symptom,dtcs,moisture,root_cause,action,odometer_km,closed_at\r\n')).toBe(true);
    expect(csv.endsWith('DF-26-00342,SB7LS4CE0ND530131,2026-11-29T13:53:00.000Z,TG,LCK-1,,,,,,,')).toBe(true);
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
    expect(table.headers).toEqual([...DEFECT_CSV_COLUMNS]);
    expect(table.records).toEqual([]);
  });
});

describe('defectsCsvFileName', () => {
  it('names the file by the UTC day', () => {
    expect(defectsCsvFileName(new Date('2026-12-02T23:30:00Z'))).toBe('seepline-defects-2026-12-02.csv');
  });
});
