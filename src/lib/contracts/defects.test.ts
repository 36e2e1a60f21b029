// The defect contracts accept what clients send (snake_case is mapped by the server, so camelCase here; text
// numbers; lists of codes) and refuse what is wrong, with messages people can act on.
import { describe, expect, it } from 'vitest';
import {
  DefectCreateSchema,
  DefectPatchSchema,
  DiagnosisFormSchema,
  DtcsField,
  FormOdometerField,
  parseOdometerText,
  reportFormSchema,
  moneyText,
  parseMoneyText,
  PartFormSchema,
  TransitionRequestSchema,
  VerificationInputSchema,
} from './defects';

describe('parseMoneyText / moneyText', () => {
  it.each([
    ['24.50', 2450],
    ['24,5', 2450],
    ['1200', 120000],
    [' 0.07 ', 7],
    ['1 234.50', 123450],
    ['', null],
    ['   ', null],
  ])('%j -> %j', (text, minor) => {
    expect(parseMoneyText(text)).toBe(minor);
  });
  it.each(['-1', '24.505', 'ten', '1e3', '12.'])('%j is not an amount', (text) => {
    expect(parseMoneyText(text)).toBeUndefined();
  });
  it('writes minor units back as text', () => {
    expect(moneyText(2450)).toBe('24.50');
    expect(moneyText(7)).toBe('0.07');
    expect(moneyText(null)).toBe('');
  });
});

describe('DtcsField', () => {
  it('normalises text or a list to one upper-case, de-duplicated text, and empty to null', () => {
    expect(DtcsField.parse(' b1a21-29,B1A22;b1a21-29 ')).toBe('B1A21-29 B1A22');
    expect(DtcsField.parse(['u0100-87', 'P0A80'])).toBe('U0100-87 P0A80');
    expect(DtcsField.parse('')).toBeNull();
    expect(DtcsField.parse(null)).toBeNull();
    expect(DtcsField.parse(undefined)).toBeUndefined();
  });
  it('refuses a code that is not of J2012 form, naming it', () => {
    const r = DtcsField.safeParse('B1A21 B9999X');
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues[0]!.message).toMatch(/^"B9999X" is not a fault code/);
  });
});

describe('DefectCreateSchema', () => {
  it('takes a lower-case door and module, text numbers, blanks as none', () => {
    const r = DefectCreateSchema.parse({ vin: ' SXPAB1CD5NK000001 ', position: 'fl', moduleCode: 'wlr-2', odometerKm: '48211', symptom: '  ', reporterName: '' });
    expect(r).toEqual({ vin: 'SXPAB1CD5NK000001', position: 'FL', moduleCode: 'WLR-2', odometerKm: 48211, symptom: null, reporterName: null });
  });
  it.each([
    [{ position: 'XX' }, 'position'],
    [{ odometerKm: 12.5 }, 'odometerKm'],
    [{ odometerKm: -1 }, 'odometerKm'],
    [{ moisture: 'damp' }, 'moisture'],
    [{ reportedAt: '31/12/2024' }, 'reportedAt'],
    [{ vin: '' }, 'vin'],
  ])('refuses %j at %s', (over, path) => {
    const r = DefectCreateSchema.safeParse({ vin: 'SXPAB1CD5NK000001', position: 'FL', moduleCode: 'WLR-2', ...over });
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues.map((i) => i.path.join('.'))).toContain(path);
  });
});

describe('DefectPatchSchema', () => {
  it('keeps only what was given; null clears', () => {
    expect(DefectPatchSchema.parse({ version: '3', notes: null, labourMinutes: '95' })).toEqual({ version: 3, notes: null, labourMinutes: 95 });
    expect(DefectPatchSchema.parse({})).toEqual({});
  });
  it('takes part lines with numbers as text', () => {
    expect(DefectPatchSchema.parse({ parts: [{ partNumber: ' PN-1 ', quantity: '2', unitCostMinor: '2450' }] }).parts).toEqual([
      { partNumber: 'PN-1', description: null, quantity: 2, unitCostMinor: 2450 },
    ]);
  });
});

describe('the diagnosis form', () => {
  it('turns typed part lines into parts, amounts into minor units', () => {
    expect(PartFormSchema.parse({ partNumber: 'CM-WL2-4471', description: ' Motor ', quantity: '1', unitCost: '189' })).toEqual({
      partNumber: 'CM-WL2-4471',
      description: 'Motor',
      quantity: 1,
      unitCostMinor: 18900,
    });
    expect(PartFormSchema.parse({ partNumber: 'X', description: '', quantity: '3', unitCost: '' }).unitCostMinor).toBeNull();
  });
  it('names the field of each mistake', () => {
    const r = DiagnosisFormSchema.safeParse({
      moisture: 'corrosion',
      membraneCondition: 'soggy',
      labourMinutes: 'ninety',
      parts: [{ partNumber: '', description: '', quantity: '0', unitCost: '1.234' }],
    });
    expect(r.success).toBe(false);
    if (!r.success) {
      expect(r.error.issues.map((i) => i.path.join('.')).sort()).toEqual(['labourMinutes', 'membraneCondition', 'parts.0.partNumber', 'parts.0.quantity', 'parts.0.unitCost']);
    }
  });
});

describe('transitions and the verification', () => {
  it('needs both checks ticked, and the version', () => {
    expect(VerificationInputSchema.safeParse({ reinitialised: true, reversalVerified: true }).success).toBe(true);
    expect(VerificationInputSchema.safeParse({ reinitialised: true, reversalVerified: false }).success).toBe(false);
    expect(VerificationInputSchema.safeParse({ reinitialised: 'yes', reversalVerified: true }).success).toBe(false);
    expect(TransitionRequestSchema.safeParse({ to: 'closed' }).success).toBe(false);
    expect(TransitionRequestSchema.parse({ to: 'cancelled', version: 2, reason: '  Duplicate  ' })).toEqual({ to: 'cancelled', version: 2, reason: 'Duplicate' });
  });
});

describe('the forms: odometer with thousands separators, reported time against the build month', () => {
  it.each([
    ['84512', 84512],
    ['84,512', 84512],
    ['84 512', 84512],
    ['84.512', 84512],
    ["1'204'512", 1204512],
    ['1,204,512 km', 1204512],
    ['', null],
  ])('odometer %j is %j', (text, km) => {
    expect(parseOdometerText(text)).toBe(km);
    expect(FormOdometerField.parse(text)).toBe(km);
  });
  it.each(['84,51', '84,512.5', '8,4512', '84,512 512', '1,204.512', 'about 80k', '-5'])('odometer %j is refused', (text) => {
    expect(parseOdometerText(text)).toBeUndefined();
    const r = FormOdometerField.safeParse(text);
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues[0]!.message).toBe('Odometer must be a whole number of km, such as 84512 or 84,512');
  });
  it('refuses a report dated before the chosen vehicle was built, naming the month', () => {
    const base = { vin: 'SXPAB1CD5NK000001', position: 'FL', moduleCode: 'LCK-1', symptom: 'Lock does not engage', dtcs: '', odometerKm: '', reporterName: '' };
    const r = reportFormSchema({ buildMonth: '2022-01' }).safeParse({ ...base, reportedAt: '2019-01-01T10:00' });
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues.map((i) => [i.path.join('.'), i.message])).toEqual([['reportedAt', 'Reported at is before the vehicle was built (Jan 2022): check the date']]);
    expect(reportFormSchema({ buildMonth: '2022-01' }).safeParse({ ...base, reportedAt: '2022-01-01T00:00' }).success).toBe(true);
    expect(reportFormSchema().safeParse({ ...base, reportedAt: '2019-01-01T10:00' }).success).toBe(true);
  });
});
