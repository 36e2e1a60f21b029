// Patterns in the browser on the demo scenario (seed/README.md: a water-ingress WLR-2 cohort at the wet depots and a
// dry MRM-4 mirror batch). A fleet manager finds the water-ingress cohort, sees why it is flagged, plans a campaign
// and opens the evidence pack; a supervisor reads it without actions; and the screens fit a 768 px tablet.
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { bodyRows, columnTexts, demoUser, E2E_DB_PATH, loginAs, open, pathOf, useBrowser } from './fixtures';

const h = useBrowser();
let db: Database.Database;
beforeAll(() => {
  db = new Database(E2E_DB_PATH, { readonly: true, fileMustExist: true });
});
afterAll(() => db?.close());

const table = (page: Page) => page.getByRole('table', { name: 'Patterns', exact: true });

async function waitForPatterns(page: Page): Promise<void> {
  await page.getByRole('heading', { level: 1, name: 'Patterns' }).waitFor();
  await table(page).waitFor({ timeout: 30_000 });
  await expect.poll(async () => (await table(page).getAttribute('aria-busy')) === 'false' && (await bodyRows(table(page)).count()) > 0, { timeout: 30_000 }).toBe(true);
}

/** Page width beyond the viewport, in CSS pixels. */
async function overflowPx(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
}

let patternPath = '';

describe('Patterns as fleet manager', () => {
  beforeAll(async () => loginAs(h.context, 'manager'));

  it('finds the water-ingress cohort in the table', async () => {
    const page = h.page;
    await open(page, '/patterns');
    await waitForPatterns(page);
    // The records are synced on opening: every significant row gets a status.
    await page.getByText(/^Records (updated|up to date)/).waitFor();
    const statuses = await columnTexts(table(page), /^Status$/);
    expect(statuses.length).toBeGreaterThanOrEqual(2);
    expect(statuses.every((s) => s.startsWith('New'))).toBe(true);

    await page.getByRole('search', { name: 'Filter patterns' }).getByLabel('Water', { exact: true }).selectOption('water_ingress');
    await expect.poll(() => pathOf(page)).toContain('water=water_ingress');
    await expect.poll(() => bodyRows(table(page)).count()).toBe(1);
    const row = bodyRows(table(page)).first();
    expect(await row.textContent()).toContain('Water ingress');
    expect(await row.textContent()).toContain('Oct 2022 – Mar 2023');
    await row.getByRole('link', { name: /^WLR-2, high exposure/ }).click();
    await page.waitForURL((u) => /^\/patterns\/\d+$/.test(u.pathname));
    patternPath = new URL(page.url()).pathname;
  });

  it('shows why it is flagged: the figures, the chart by build month and the moisture evidence', async () => {
    const page = h.page;
    await page.getByRole('heading', { level: 1, name: /^WLR-2 .* built Oct 2022 – Mar 2023, high moisture exposure$/ }).waitFor();
    const why = page.getByRole('region', { name: 'Why it is flagged' });
    await why.waitFor();
    expect(await why.textContent()).toMatch(/\d+ failures on \d+ vehicles where [\d.]+ would be expected/);

    const chart = page.getByRole('img', { name: /^Failures by build month against the fleet-rate expectation/ });
    await chart.waitFor();
    await expect.poll(() => chart.locator('.recharts-bar-rectangle').count()).toBeGreaterThan(10);
    // The cohort's months are shaded.
    expect(await chart.locator('.recharts-reference-area').count()).toBe(1);

    const water = page.getByRole('region', { name: 'Is it water?' });
    expect(await water.textContent()).toMatch(/Water was found .* in \d+ of the \d+ diagnosed failures/);
    const rule = water.getByRole('list', { name: 'The water-ingress rule' });
    expect(await rule.getByLabel('met', { exact: true }).count()).toBe(3);
    await water.getByText(/^Called water ingress/).waitFor();

    const ageing = page.getByRole('region', { name: 'Failures as vehicles age' });
    const mcf = ageing.getByRole('img', { name: /^Mean cumulative function by exposure band/ });
    await expect.poll(() => mcf.locator('.recharts-line').count(), { timeout: 20_000 }).toBeGreaterThanOrEqual(3);
    await ageing.getByText(/Laplace U = /).first().waitFor();

    // The defects behind it link to their records.
    const id = Number(patternPath.split('/')[2]);
    const snap = JSON.parse((db.prepare('select snapshot from pattern_records where id = ?').get(id) as { snapshot: string }).snapshot) as { cohort: { failureIds: number[] } };
    const defects = page.getByRole('table', { name: 'Failures behind this pattern' });
    expect(await bodyRows(defects).count()).toBe(snap.cohort.failureIds.length);
    expect(await defects.locator('tbody a[href^="/defects/"]').count()).toBe(snap.cohort.failureIds.length);
  });

  it('plans a campaign: the form asks for what it needs, then the status and history show it', async () => {
    const page = h.page;
    await page.getByRole('button', { name: 'Plan a campaign' }).click();
    const dialog = page.getByRole('dialog', { name: /^Plan a campaign: WLR-2/ });
    await dialog.waitFor();
    await dialog.getByRole('button', { name: 'Save the campaign' }).click();
    await dialog.getByText('Say what the campaign does (at least 3 characters)').waitFor();
    await dialog.getByLabel('Campaign', { exact: false }).first().selectOption('new_membranes');
    await dialog.getByLabel(/^What the campaign does/).fill('Fit new membranes and clear the drain holes on every cohort van at GHQ and SMP');
    await dialog.getByLabel(/^Target date/).fill('2027-02-28');
    await dialog.getByRole('button', { name: 'Save the campaign' }).click();
    await dialog.waitFor({ state: 'hidden' });

    const status = page.getByRole('region', { name: 'Status' });
    await status.getByText('Fit new door membranes and seals').waitFor();
    expect(await status.textContent()).toContain('Campaign planned');
    expect(await status.textContent()).toContain(`by ${demoUser('manager').name}`);
    const history = page.getByRole('region', { name: 'History' });
    await history.getByText(demoUser('manager').name, { exact: false }).first().waitFor();

    const row = db.prepare('select status, campaign_kind as kind, campaign_target_date as target from pattern_records where id = ?').get(Number(patternPath.split('/')[2]));
    expect(row).toEqual({ status: 'campaign_planned', kind: 'new_membranes', target: '2027-02-28' });
    const audit = db.prepare("select count(*) as n from audit_log where entity = 'pattern' and entity_id = ? and action = 'status'").get(patternPath.split('/')[2]) as { n: number };
    expect(audit.n).toBe(4); // status, campaign kind, note and target date
  });

  it('opens the printable evidence pack', async () => {
    const page = h.page;
    await page.getByRole('link', { name: 'Open the evidence pack' }).click();
    await page.waitForURL((u) => u.pathname === `${patternPath}/evidence`);
    await page.getByRole('heading', { level: 1, name: /^WLR-2 .* built Oct 2022 – Mar 2023/ }).waitFor();
    expect(await page.getByText(`${demoUser('manager').name} (Fleet manager)`).count()).toBeGreaterThan(0);
    await page.getByRole('heading', { name: 'Method in brief' }).waitFor();
    await page.getByRole('heading', { name: 'Hall-sensor trace verdicts' }).waitFor();
    await expect.poll(() => page.locator('.ev-chart .recharts-bar-rectangle').count()).toBeGreaterThan(10);
    await expect.poll(() => page.locator('.ev-chart .recharts-line').count()).toBeGreaterThanOrEqual(3);
    const id = Number(patternPath.split('/')[2]);
    const failures = (db.prepare('select failures from pattern_records where id = ?').get(id) as { failures: number }).failures;
    expect(await bodyRows(page.getByRole('table', { name: 'Defects of the cohort' })).count()).toBe(failures);
    // Printed: no navigation, no buttons; the page content only.
    await page.emulateMedia({ media: 'print' });
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false);
    expect(await page.getByRole('button', { name: 'Print or save as PDF' }).isVisible()).toBe(false);
    await page.emulateMedia({ media: 'screen' });
  });
});

describe('Patterns as depot supervisor', () => {
  beforeAll(async () => loginAs(h.context, 'supervisor'));

  it('reads the pattern of their depot without actions, and is sent back from the evidence pack', async () => {
    const page = h.page;
    await open(page, '/patterns');
    await waitForPatterns(page);
    await page.getByText(/^Figures cover your depots only \(GHQ\)/).waitFor();
    expect(await page.getByRole('button', { name: 'Refresh records' }).count()).toBe(0);
    await open(page, patternPath);
    await page.getByRole('region', { name: 'Why it is flagged' }).waitFor();
    await page.getByText('Read only: fleet managers and admins decide what to do about a pattern.').waitFor();
    for (const name of ['Plan a campaign', 'Acknowledge', 'Dismiss', 'Mark resolved', 'Change the campaign']) expect(await page.getByRole('button', { name }).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Open the evidence pack' }).count()).toBe(0);
    // The lists are cut to GHQ.
    const depots = await columnTexts(page.getByRole('table', { name: 'Vehicles in the cohort' }), /^Depot$/);
    expect(depots.length).toBeGreaterThan(0);
    expect(new Set(depots)).toEqual(new Set(['GHQ']));
    await open(page, `${patternPath}/evidence`);
    await page.waitForURL((u) => u.pathname === patternPath);
  });
});

describe('Patterns on a 768 px tablet', () => {
  beforeAll(async () => {
    await loginAs(h.context, 'manager');
    await h.page.setViewportSize({ width: 768, height: 1024 });
  });
  afterAll(async () => h.page.setViewportSize({ width: 1280, height: 900 }));

  it('the table and the pattern page fit the width, with tap-sized controls', async () => {
    const page = h.page;
    await open(page, '/patterns');
    await waitForPatterns(page);
    expect(await overflowPx(page)).toBeLessThanOrEqual(1);
    const nav = page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Patterns', exact: true });
    expect(await nav.getAttribute('aria-current')).toBe('page');
    expect((await nav.boundingBox())!.height).toBeGreaterThanOrEqual(40);
    // Compact columns: the verdict sits under the pattern's name.
    expect(await table(page).locator('thead th').count()).toBe(5);

    await open(page, patternPath);
    await page.getByRole('region', { name: 'Why it is flagged' }).waitFor();
    await page.getByRole('img', { name: /^Failures by build month/ }).locator('.recharts-bar-rectangle').first().waitFor();
    expect(await overflowPx(page)).toBeLessThanOrEqual(1);
    for (const name of ['Change the campaign', 'Mark resolved']) {
      const box = await page.getByRole('button', { name }).boundingBox();
      expect(box!.height, name).toBeGreaterThanOrEqual(40);
    }
  });
});
