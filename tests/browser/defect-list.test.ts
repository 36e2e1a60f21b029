// The Defects list in the browser: filters land in the URL, survive a reload and step back and forward with
// the browser's history; the CSV download holds every row of the current view (all pages) and re-imports
// cleanly; a technician lands on their own open defects with the repeat flag linking to the earlier defect.
// Expected counts come straight from the database the server runs on (an independent query).
import fs from 'node:fs';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { bodyRows, columnTexts, demoUser, E2E_DB_PATH, loginAs, open, pathOf, useBrowser } from './fixtures';
import { readCsv } from '../../src/lib/imports/csv-read';
import { validateRows } from '../../src/lib/imports/rows';

const h = useBrowser();
let db: Database.Database;
beforeAll(() => {
  db = new Database(E2E_DB_PATH, { readonly: true, fileMustExist: true });
});
afterAll(() => db?.close());

const OPEN = "('reported','diagnosing','awaiting_parts','repaired','verified')";
const DAY_MS = 86_400_000;
const fmt = (n: number) => n.toLocaleString('en-GB');

/** Defects matching a WHERE over x (defects), d (depots), m (modules). */
function countDefects(where: string, ...params: (string | number)[]): number {
  return (db.prepare(`select count(*) as n from defects x join depots d on d.id = x.depot_id join modules m on m.id = x.module_id where ${where}`).get(...params) as { n: number }).n;
}
function refsWhere(where: string, ...params: (string | number)[]): string[] {
  return (db.prepare(`select x.ref from defects x join depots d on d.id = x.depot_id join modules m on m.id = x.module_id where ${where}`).all(...params) as { ref: string }[]).map((r) => r.ref).sort();
}

const table = (page: Page) => page.getByRole('table', { name: 'Defects', exact: true });
const filters = (page: Page) => page.getByRole('search', { name: 'Filter defects' });

/** Wait for the list to settle and return the count line. */
async function settledCount(page: Page): Promise<string> {
  await expect.poll(async () => (await table(page).getAttribute('aria-busy')) === 'false').toBe(true);
  return (await page.getByTestId('defect-count').textContent()) ?? '';
}
const matchLine = (n: number) => `${fmt(n)} ${n === 1 ? 'defect matches' : 'defects match'} this view`;

describe('Defects list as the GHQ supervisor', () => {
  beforeAll(async () => loginAs(h.context, 'supervisor'));

  it('puts filters in the URL, keeps them on reload, and steps back and forward', async () => {
    const page = h.page;
    await open(page, '/defects');
    const ghq = countDefects("d.code = 'GHQ'");
    await expect.poll(() => settledCount(page)).toBe(`${fmt(ghq)} defects in your depots`);

    const wlr = countDefects("d.code = 'GHQ' and m.code = 'WLR-2'");
    await filters(page).getByLabel('Module type', { exact: true }).selectOption('WLR-2');
    await expect.poll(() => pathOf(page)).toBe('/defects?module=WLR-2');
    await expect.poll(() => settledCount(page)).toBe(matchLine(wlr));

    await filters(page).getByLabel('Open only').check();
    await expect.poll(() => pathOf(page)).toBe('/defects?open=1&module=WLR-2');
    const cutoff = Date.now() - 14 * DAY_MS;
    await filters(page).getByLabel('Age', { exact: true }).selectOption('14');
    await expect.poll(() => pathOf(page)).toBe('/defects?open=1&module=WLR-2&olderThanDays=14');
    const aged = countDefects(`d.code = 'GHQ' and m.code = 'WLR-2' and x.status in ${OPEN} and x.reported_at < ?`, cutoff);
    expect(aged).toBeGreaterThan(0);
    expect(aged).toBeLessThan(wlr);
    await expect.poll(() => settledCount(page)).toBe(matchLine(aged));
    expect(await bodyRows(table(page)).count()).toBe(aged);

    await page.reload();
    await expect.poll(() => settledCount(page)).toBe(matchLine(aged));
    expect(pathOf(page)).toBe('/defects?open=1&module=WLR-2&olderThanDays=14');
    expect(await filters(page).getByLabel('Module type', { exact: true }).inputValue()).toBe('WLR-2');
    expect(await filters(page).getByLabel('Age', { exact: true }).inputValue()).toBe('14');
    expect(await filters(page).getByLabel('Open only').isChecked()).toBe(true);

    // Back undoes the age filter, then "Open only"; Forward brings the age filter back.
    await page.goBack();
    await expect.poll(() => pathOf(page)).toBe('/defects?open=1&module=WLR-2');
    expect(await filters(page).getByLabel('Age', { exact: true }).inputValue()).toBe('');
    await expect.poll(() => settledCount(page)).toBe(matchLine(countDefects(`d.code = 'GHQ' and m.code = 'WLR-2' and x.status in ${OPEN}`)));
    await page.goBack();
    await expect.poll(() => pathOf(page)).toBe('/defects?module=WLR-2');
    expect(await filters(page).getByLabel('Open only').isChecked()).toBe(false);
    await page.goForward();
    await page.goForward();
    await expect.poll(() => pathOf(page)).toBe('/defects?open=1&module=WLR-2&olderThanDays=14');
    await expect.poll(() => settledCount(page)).toBe(matchLine(aged));
  });

  it('filters by several statuses and a door, and a shared link opens the same view', async () => {
    const page = h.page;
    await open(page, '/defects?status=diagnosing,awaiting_parts&position=FR');
    const n = countDefects("d.code = 'GHQ' and x.status in ('diagnosing','awaiting_parts') and x.position = 'FR'");
    await expect.poll(() => settledCount(page)).toBe(matchLine(n));
    const more = filters(page);
    expect(await more.getByRole('button', { name: 'Awaiting parts' }).getAttribute('aria-pressed')).toBe('true');
    expect(await more.getByRole('button', { name: 'FR', exact: true }).getAttribute('aria-pressed')).toBe('true');
    await more.getByRole('button', { name: 'Clear filters (3)' }).click();
    await expect.poll(() => pathOf(page)).toBe('/defects');
  });

  it('downloads every row of the current view as CSV in the import format, not just the page on screen', async () => {
    const page = h.page;
    await open(page, '/defects?status=closed&pageSize=25');
    const expected = refsWhere("d.code = 'GHQ' and x.status = 'closed'");
    expect(expected.length).toBeGreaterThan(25);
    await expect.poll(() => settledCount(page)).toBe(matchLine(expected.length));
    expect(await bodyRows(table(page)).count()).toBe(25);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download CSV' }).click()]);
    expect(download.suggestedFilename()).toMatch(/^seepline-defects-\d{4}-\d{2}-\d{2}\.csv$/);
    const csv = fs.readFileSync((await download.path())!, 'utf8');
    const parsed = readCsv(csv);
    expect(parsed.records.map((r) => r.cells.ref).sort()).toEqual(expected);
    const v = validateRows('defects', parsed);
    expect(v.errors).toEqual([]);
    expect(v.rows).toHaveLength(expected.length);
    // After the import columns: the report columns, with each defect's status and depot.
    expect(parsed.headers.slice(12, 16)).toEqual(['status', 'depot_code', 'fleet_number', 'registration']);
    expect(parsed.headers).toEqual(expect.arrayContaining(['parts', 'labour_minutes', 'cost', 'currency']));
    expect(new Set(parsed.records.map((r) => `${r.cells.status}/${r.cells.depot_code}`))).toEqual(new Set(['closed/GHQ']));
  });

  it('catches a "from" after the "to" in the filter itself: a clear message, no request, nothing stuck', async () => {
    const page = h.page;
    await open(page, '/defects?reportedFrom=2026-11-30&reportedTo=2026-11-01');
    const message = '"Reported from" is after "Reported to". Change one of the dates to see the list.';
    await filters(page).getByRole('alert').filter({ hasText: message }).waitFor();
    expect(await page.getByTestId('defect-count').textContent()).toBe('No list for this date range.');
    expect(await filters(page).getByLabel('Reported from').getAttribute('aria-invalid')).toBe('true');
    expect(await page.getByRole('link', { name: 'Download CSV' }).getAttribute('aria-disabled')).toBe('true');
    // Putting the dates the right way round loads the list.
    await filters(page).getByLabel('Reported to').fill('2026-12-31');
    await expect.poll(() => pathOf(page)).toBe('/defects?reportedFrom=2026-11-30&reportedTo=2026-12-31');
    const n = countDefects("d.code = 'GHQ' and x.reported_at >= ? and x.reported_at <= ?", Date.UTC(2026, 10, 30), Date.UTC(2026, 11, 31, 23, 59, 59, 999));
    await expect.poll(() => settledCount(page)).toBe(matchLine(n));
    expect(await filters(page).getByRole('alert').count()).toBe(0);
  });
});

describe('Defects list as the GHQ technician', () => {
  let techId: number;
  beforeAll(async () => {
    await loginAs(h.context, 'technician');
    techId = (db.prepare('select id from users where email = ?').get(demoUser('technician').email) as { id: number }).id;
  });

  it('lands on "My open defects", with repeats linked to the earlier defect', async () => {
    const page = h.page;
    await open(page, '/defects');
    await expect.poll(() => pathOf(page)).toBe('/defects?mine=1&open=1');
    expect(await page.getByRole('tab', { name: 'My open defects' }).getAttribute('aria-selected')).toBe('true');
    const mine = refsWhere(`x.status in ${OPEN} and (x.assigned_to_id = ? or x.reported_by_id = ?)`, techId, techId);
    expect(mine.length).toBeGreaterThan(0);
    await expect.poll(() => settledCount(page)).toBe(matchLine(mine.length));
    expect((await columnTexts(table(page), /^(Ref|Defect)$/, { firstLink: true })).sort()).toEqual(mine);

    const repeat = db
      .prepare(`select x.ref, e.ref as earlier, e.id as earlier_id from defects x join defects e on e.id = x.repeat_of_id where x.ref in (${mine.map(() => '?').join(',')})`)
      .get(...mine) as { ref: string; earlier: string; earlier_id: number } | undefined;
    // The demo (fixed seed and day) gives this technician an open repeat repair.
    expect(repeat, 'an open repeat among the technician\'s defects').toBeDefined();
    const link = table(page).getByRole('link', { name: `Repeat of ${repeat!.earlier}` });
    expect(await link.getAttribute('href')).toBe(`/defects/${repeat!.earlier_id}`);
    expect(await link.textContent()).toContain('Repeat');
  });

  it('keeps "My open defects" to open defects when filters are cleared', async () => {
    const page = h.page;
    await open(page, '/defects?mine=1&open=1&module=WLR-2');
    await filters(page).getByRole('button', { name: 'Clear filters (1)' }).click();
    await expect.poll(() => pathOf(page)).toBe('/defects?mine=1&open=1');
    expect(await page.getByRole('tab', { name: 'My open defects' }).getAttribute('aria-selected')).toBe('true');
    const mine = refsWhere(`x.status in ${OPEN} and (x.assigned_to_id = ? or x.reported_by_id = ?)`, techId, techId);
    await expect.poll(() => settledCount(page)).toBe(matchLine(mine.length));
    // The tab's own constraint shows, and cannot be switched off under the tab.
    const openOnly = filters(page).getByLabel('Open only');
    expect([await openOnly.isChecked(), await openOnly.isDisabled()]).toEqual([true, true]);
    // A shared link asking for closed ones under the tab is brought back to the tab's view.
    await open(page, '/defects?mine=1&status=closed');
    await expect.poll(() => pathOf(page)).toBe('/defects?mine=1&open=1');
    await expect.poll(() => settledCount(page)).toBe(matchLine(mine.length));
  });

  it('switches to all defects, and a reload stays there', async () => {
    const page = h.page;
    await open(page, '/defects');
    await expect.poll(() => pathOf(page)).toBe('/defects?mine=1&open=1');
    await page.getByRole('tab', { name: 'All defects' }).click();
    await expect.poll(() => pathOf(page)).toBe('/defects?mine=0');
    const all = countDefects("d.code = 'GHQ'");
    await expect.poll(() => settledCount(page)).toBe(`${fmt(all)} defects in your depots`);
    await page.reload();
    await expect.poll(() => settledCount(page)).toBe(`${fmt(all)} defects in your depots`);
    expect(await page.getByRole('tab', { name: 'All defects' }).getAttribute('aria-selected')).toBe('true');
  });

  it('offers "Report a defect" to people who may report, and not to a viewer', async () => {
    const page = h.page;
    await open(page, '/defects');
    expect(await page.getByRole('link', { name: 'Report a defect' }).getAttribute('href')).toBe('/defects/new');
    await loginAs(h.context, 'viewer');
    await open(page, '/defects');
    await settledCount(page);
    expect(await page.getByRole('link', { name: 'Report a defect' }).count()).toBe(0);
    expect(await page.getByRole('tab').count()).toBe(0);
  });
});

describe('Defects list at 768 px', () => {
  it('fits the tablet width with the filters and the list', async () => {
    const page = h.page;
    await loginAs(h.context, 'technician');
    await page.setViewportSize({ width: 768, height: 1024 });
    await open(page, '/defects?mine=0');
    await settledCount(page);
    expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(1);
    const tab = await page.getByRole('tab', { name: 'My open defects' }).boundingBox();
    expect(tab!.height).toBeGreaterThanOrEqual(40);
    await page.setViewportSize({ width: 1280, height: 900 });
  });
});
