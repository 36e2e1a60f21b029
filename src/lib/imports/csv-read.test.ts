import { describe, expect, it } from 'vitest';
import { readCsv } from './csv-read';
import { recordLabel, recordReferences, validateRows } from './rows';

describe('readCsv: data rows and spreadsheet lines', () => {
  it('numbers data rows from 1 (CONTRACT.md) and keeps each row\'s line in the sheet, blank rows included', () => {
    const t = readCsv('code,name\r\nA,One\r\n\r\nB,"Two\nlines"\r\nC,Three\r\n\r\n');
    expect(t.headerLine).toBe(1);
    // A is on line 2; line 3 is blank; B is on line 4 (its quoted line break stays inside one spreadsheet row); C on 5.
    expect(t.records.map((r) => [r.row, r.line, r.cells.code])).toEqual([
      [1, 2, 'A'],
      [2, 4, 'B'],
      [3, 5, 'C'],
    ]);
  });
  it('counts blank rows above the header', () => {
    const t = readCsv('\n\ncode;name\nA;One\n');
    expect([t.headerLine, t.records[0]!.line, t.delimiter]).toEqual([3, 4, ';']);
  });
});

describe('recordLabel', () => {
  it('names a row by code, VIN or ref as written', () => {
    expect(recordLabel('depots', { code: 'ghq' })).toBe('code ghq');
    expect(recordLabel('vehicles', { vin: 'SB7LS4DE4ND530116' })).toBe('VIN SB7LS4DE4ND530116');
    expect(recordLabel('defects', { ref: 'QA-IMP-002', vin: 'SB7LS4DE4ND530116' })).toBe('ref QA-IMP-002');
    expect(recordLabel('defects', { ref: '', vin: 'SB7LS4DE4ND530116' })).toBe('VIN SB7LS4DE4ND530116');
    expect(recordLabel('modules', { code: '  ' })).toBeNull();
  });
});

describe('recordReferences', () => {
  it('gives the references of every row, valid or not, upper-cased, leaving out empty and malformed ones', () => {
    const t = readCsv(
      'ref,vin,reported_at,position,module_code\n' +
        'R1,sb7ls4de4nd530116,2024-01-01,FL,wlr-7\n' + // valid row
        'R2,SB7LS4DE4ND530116,not a date,XX,DCM-1\n' + // field problems, but its references are well-formed
        'R3,NOT-A-VIN,2024-01-01,FL,\n', // malformed VIN, empty module: their own problems say so
    );
    expect(recordReferences('defects', t)).toEqual([
      { row: 1, column: 'vin', value: 'SB7LS4DE4ND530116' },
      { row: 1, column: 'module_code', value: 'WLR-7' },
      { row: 2, column: 'vin', value: 'SB7LS4DE4ND530116' },
      { row: 2, column: 'module_code', value: 'DCM-1' },
    ]);
    expect(validateRows('defects', t).rows.map((r) => r.row)).toEqual([1]);
  });
  it('gives the depot code of every vehicle row', () => {
    const t = readCsv('vin,build_date,in_service_date,depot_code,parking,washes_per_month\nX,2022-13,2022-01-01,nope,boat,1\nY,2022-01,2022-01-01,,outdoor,1\n');
    expect(recordReferences('vehicles', t)).toEqual([{ row: 1, column: 'depot_code', value: 'NOPE' }]);
    expect(recordReferences('depots', t)).toEqual([]);
  });
});
