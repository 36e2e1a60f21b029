// Import as a fleet manager: a vehicles file with one bad row is refused with the row (and its spreadsheet line
// and VIN), column and message; a defects file's problems all come in one pass; a good depots file is checked,
// imported, and then checks as unchanged.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { baseUrl, bodyRows, loginAs, open, useBrowser } from './fixtures';

const h = useBrowser();
let dir: string;
beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'seepline-e2e-import-'));
  await loginAs(h.context, 'manager');
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

function writeCsv(name: string, text: string): string {
  const file = path.join(dir, name);
  fs.writeFileSync(file, text);
  return file;
}

// Row 1 is valid (a VIN outside North America, at a seeded depot); row 2 has a parking value that does not exist.
const VEHICLES_ONE_BAD_ROW =
  'vin,fleet_number,registration,make,model,body,build_date,in_service_date,retired_date,depot_code,parking,washes_per_month\n' +
  'SX8BV2DK0RA104257,T-9001,TE24 STA,Halvenn,Carrio,panel van,2023-11,2024-02-05,,GHQ,outdoor,4\n' +
  'SX8BV2DK0RA104258,T-9002,TE24 STB,Halvenn,Carrio,panel van,2023-11,2024-02-05,,GHQ,garage,4\n';

const DEPOTS_GOOD =
  'code,name,region,coastal,rain_days_per_year,mean_rh_pct,wash_bay,inspection_slots_per_day,timezone\n' +
  'BRK,Brackwater Yard,South Shore,yes,174,83,yes,2,Europe/London\n' +
  'UPV,Upvale Sheds,High Moor,no,160,80,no,1,Europe/London\n';

/** The figure under a count tile ("Rows read", "Would add", …). */
async function tile(page: Page, label: string): Promise<string> {
  const dd = page.getByRole('term').filter({ hasText: new RegExp(`^${label}$`) }).locator('xpath=following-sibling::dd');
  return ((await dd.textContent()) ?? '').trim();
}

async function pickKind(page: Page, kind: 'Depots' | 'Vehicles'): Promise<void> {
  const radio = page.getByRole('radio', { name: new RegExp(`^${kind}`) });
  await radio.click();
  await expect.poll(() => radio.getAttribute('aria-checked')).toBe('true');
  await page.getByRole('heading', { name: `The ${kind.toLowerCase()} file` }).waitFor();
}

describe('Import', () => {
  it('refuses a vehicles file with one bad row, naming the row, column and problem', async () => {
    const page = h.page;
    h.guard.expectFailure(/\/api\/import\/vehicles\?dryRun=1$/, 422);
    await open(page, '/import');
    await page.getByRole('heading', { level: 1, name: 'Import' }).waitFor();
    await pickKind(page, 'Vehicles');
    expect(new URL(page.url()).searchParams.get('kind')).toBe('vehicles');

    await page.getByLabel('CSV file to import').setInputFiles(writeCsv('fleet.csv', VEHICLES_ONE_BAD_ROW));
    await page.getByText('fleet.csv', { exact: true }).waitFor();
    const importButton = page.getByRole('button', { name: 'Import vehicles' });
    expect(await importButton.isDisabled()).toBe(true);

    await page.getByRole('button', { name: 'Check file' }).click();
    const alert = page.getByRole('alert').filter({ hasText: 'problem' });
    await alert.waitFor();
    expect(await alert.textContent()).toContain('1 problem found in 1 row.');

    const problems = page.getByRole('table', { name: 'Problems in the file' });
    const rows = bodyRows(problems);
    expect(await rows.count()).toBe(1);
    const cells = (await rows.first().getByRole('cell').allInnerTexts()).map((t) => t.trim());
    // Data row 2 (CONTRACT.md numbering) is line 3 of the sheet, under the header; the row says which vehicle it is.
    expect(cells[0]).toMatch(/^Row 2\s+line 3 in the sheet$/);
    expect(cells[1]).toBe('VIN SX8BV2DK0RA104258');
    expect(cells[2]).toBe('parking');
    expect(cells[3]).toContain('garage');
    expect(cells[3]).toMatch(/indoor, outdoor, mixed/);
    await page.getByText('row 1 is line 2', { exact: false }).waitFor();

    expect(await importButton.isDisabled()).toBe(true);
  });

  it('lists every problem of a defects row in one pass, unknown vehicle and module type included', async () => {
    const page = h.page;
    h.guard.expectFailure(/\/api\/import\/defects\?dryRun=1$/, 422);
    await open(page, '/import?kind=defects');
    await expect.poll(() => page.getByRole('radio', { name: /^Defects/ }).getAttribute('aria-checked')).toBe('true');
    const vin = (await (await page.request.get(`${baseUrl()}/api/vehicles?pageSize=1&sort=vin`)).json()).items[0].vin as string;
    const csv =
      'ref,vin,reported_at,position,module_code,symptom,dtcs,moisture\n' +
      `QA-IMP-001,${vin},2026-10-01,FL,WLR-2,ok,,\n` +
      `QA-IMP-002,SB7LS4DE4ND530116,2026-13-01,XX,WLR-7,bad,B12G4,wet\n`;
    await page.getByLabel('CSV file to import').setInputFiles(writeCsv('defects.csv', csv));
    await page.getByRole('button', { name: 'Check file' }).click();
    const problems = page.getByRole('table', { name: 'Problems in the file' });
    await problems.waitFor();
    const rows = bodyRows(problems);
    const texts = await rows.evaluateAll((trs) => trs.map((tr) => [...tr.querySelectorAll('td')].map((td) => (td as HTMLElement).innerText.trim())));
    // Every problem is in row 2 (spreadsheet line 3), named by its ref; the unknown VIN and module type come with the field problems.
    expect(new Set(texts.map((t) => t[1]))).toEqual(new Set(['ref QA-IMP-002']));
    expect(texts.every((t) => /^Row 2\s+line 3 in the sheet$/.test(t[0]!))).toBe(true);
    expect(texts.map((t) => t[2]).sort()).toEqual(['dtcs', 'module_code', 'moisture', 'position', 'reported_at', 'vin']);
    expect(texts.find((t) => t[2] === 'vin')![3]).toContain('No vehicle with VIN SB7LS4DE4ND530116');
    expect(texts.find((t) => t[2] === 'module_code')![3]).toContain('WLR-7');
  });

  it('checks, imports and re-checks a good depots file', async () => {
    const page = h.page;
    await open(page, '/import?kind=depots');
    await expect.poll(() => page.getByRole('radio', { name: /^Depots/ }).getAttribute('aria-checked')).toBe('true');
    await page.getByLabel('CSV file to import').setInputFiles(writeCsv('depots.csv', DEPOTS_GOOD));
    await page.getByText('depots.csv', { exact: true }).waitFor();

    const importButton = page.getByRole('button', { name: 'Import depots' });
    expect(await importButton.isDisabled()).toBe(true);
    await page.getByRole('button', { name: 'Check file' }).click();
    await page.getByText('No problems found.').waitFor();
    expect(await tile(page, 'Rows read')).toBe('2');
    expect(await tile(page, 'Would add')).toBe('2');
    expect(await tile(page, 'Would update')).toBe('0');
    expect(await tile(page, 'Unchanged')).toBe('0');
    // A check writes nothing.
    const codes = async () => ((await (await page.request.get(`${baseUrl()}/api/depots?pageSize=200`)).json()) as { items: { code: string; name: string }[] }).items;
    expect((await codes()).map((d) => d.code)).not.toContain('BRK');

    await expect.poll(() => importButton.isEnabled()).toBe(true);
    await importButton.click();
    const done = page.getByRole('status').filter({ hasText: 'Imported depots.csv.' });
    await done.waitFor();
    expect(await done.textContent()).toContain('2 records added, 0 updated, 0 unchanged.');
    expect(await tile(page, 'Added')).toBe('2');
    expect(await tile(page, 'Updated')).toBe('0');
    expect(await tile(page, 'Unchanged')).toBe('0');
    expect((await codes()).filter((d) => d.code === 'BRK' || d.code === 'UPV').map((d) => d.name).sort()).toEqual(['Brackwater Yard', 'Upvale Sheds']);

    // The same file again: nothing would change.
    await page.getByRole('button', { name: 'Check file' }).click();
    await page.getByText('Every row already matches what is stored; importing would change nothing.').waitFor();
    expect(await tile(page, 'Rows read')).toBe('2');
    expect(await tile(page, 'Would add')).toBe('0');
    expect(await tile(page, 'Would update')).toBe('0');
    expect(await tile(page, 'Unchanged')).toBe('2');
  });
});
