// Patterns in the browser on the demo scenario (seed/README.md: a water-ingress WLR-2 cohort at the wet depots and a
// dry MRM-4 mirror batch). A fleet manager finds the water-ingress cohort, sees why it is flagged in plain words,
// what the failures were and how they grow with age, plans (and revises) a campaign, opens the evidence pack and the
// method; reads a group that is not flagged and the report as of a past day; a supervisor reads the pattern with the
// figures of their depot only; an overdue campaign shows everywhere; and the screens fit a 768 px tablet.
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
/** No repository path and no statistics jargon on a page's first level. */
const REPO_PATH = /docs\/|\.md\b|src\//;

async function waitForPatterns(page: Page): Promise<void> {
  await page.getByRole('heading', { level: 1, name: 'Patterns' }).waitFor();
  await table(page).waitFor({ timeout: 30_000 });
  await expect.poll(async () => (await table(page).getAttribute('aria-busy')) === 'false' && (await bodyRows(table(page)).count()) > 0, { timeout: 30_000 }).toBe(true);
}

/** Page width beyond the viewport, in CSS pixels. */
async function overflowPx(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
}

const daysAhead = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

let patternPath = '';
const patternId = () => Number(patternPath.split('/')[2]);

describe('Patterns as fleet manager', () => {
  beforeAll(async () => loginAs(h.context, 'manager'));

  it('finds the water-ingress cohort in the table; the two ratios are told apart', async () => {
    const page = h.page;
    await open(page, '/patterns');
    await waitForPatterns(page);
    // The records are synced on opening: every significant row gets a status.
    await page.getByText(/^Records (updated|up to date)/).waitFor();
    const statuses = await columnTexts(table(page), /^Status$/);
    expect(statuses.length).toBeGreaterThanOrEqual(2);
    expect(statuses.every((s) => s.startsWith('New'))).toBe(true);
    // Both ratios carry their meaning on the header; the rename of "repeats" too.
    expect(await table(page).locator('thead [title^="Rate ratio against the rest"]').count()).toBe(1);
    expect(await table(page).locator('thead [title^="Failures against expected"]').count()).toBe(1);
    expect(await columnTexts(table(page), /^Vehicles failing twice or more$/)).toHaveLength(statuses.length);
    // "1 vehicles" never: counts agree with their nouns.
    expect(await table(page).textContent()).not.toMatch(/\b1 vehicles\b|\b1 failures\b/);

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

  it('shows why it is flagged in plain words, with the statistics one click deeper', async () => {
    const page = h.page;
    await page.getByRole('heading', { level: 1, name: /^WLR-2 .* built Oct 2022 – Mar 2023, high moisture exposure$/ }).waitFor();
    const why = page.getByRole('region', { name: 'Why it is flagged' });
    await why.waitFor();
    const whyText = (await why.textContent())!;
    expect(whyText).toMatch(/\d+ failures on \d+ vehicles, where \d+ would be expected at the fleet's rate for WLR-2 \([\d.]+ times that\)\. Compared with the rest of the fleet/);
    expect(whyText).toContain('Far beyond chance');
    expect(whyText).toContain('counts as a failure of the module, whatever its root cause');
    const water = page.getByRole('region', { name: 'Is it water?' });
    expect(await water.textContent()).toMatch(/Water was found in \d+ of the \d+ diagnosed failures/);
    expect(await water.getByRole('list', { name: 'The water-ingress rule' }).getByLabel('met', { exact: true }).count()).toBe(3);
    await water.getByText(/^Called water ingress/).waitFor();
    const ageing = page.getByRole('region', { name: 'Failures as vehicles age' });
    await ageing.getByText(/^(Failures in this group are coming|No clear sign|Not clear: one of the two tests)/).first().waitFor();
    // No jargon and no repository path on the first level.
    for (const region of [why, water, ageing]) {
      const text = (await region.textContent())!;
      expect(text).not.toMatch(/Laplace|MIL-HDBK|Fisher|χ²|β =|×10|q = |p = /);
      expect(text).not.toMatch(REPO_PATH);
    }
    // One click deeper: the exact statistics, and the method as a page of the app.
    const details = page.locator('details', { hasText: 'The statistics behind this' });
    await details.locator('summary').click();
    await details.getByText(/Laplace U = /).first().waitFor();
    await details.getByText(/q = 9\.0×10/).waitFor();
    expect(await details.textContent()).not.toMatch(REPO_PATH);
    expect(await details.getByRole('link', { name: 'How Seepline finds patterns' }).getAttribute('href')).toBe('/patterns/method');
  });

  it('charts: every build month on the axis with axis titles; the MCF of the group against the rest of its band answers a hover', async () => {
    const page = h.page;
    const chart = page.getByRole('img', { name: /^Failures by build month against the expectation at the fleet's rate/ });
    await chart.waitFor();
    await expect.poll(() => chart.locator('.recharts-bar-rectangle').count()).toBeGreaterThan(10);
    expect(await chart.locator('.recharts-reference-area').count()).toBe(1);
    await chart.getByText('Build month', { exact: true }).waitFor();
    await chart.getByText('Failures', { exact: true }).waitFor();
    // The x axis holds every month from the first build month to the last: months without vehicles are gaps, named
    // in the chart's summary, not squeezed out.
    const months = snap().cohort.byMonth.map((m) => m.month);
    const [fy, fm] = months[0]!.split('-').map(Number) as [number, number];
    const [ly, lm] = months.at(-1)!.split('-').map(Number) as [number, number];
    const empty = (ly - fy) * 12 + (lm - fm) + 1 - months.length;
    const label = (await chart.getAttribute('aria-label'))!;
    if (empty > 0) expect(label).toContain(`${empty} ${empty === 1 ? 'month' : 'months'} without vehicles of the band`);
    else expect(label).not.toContain('without vehicles');

    const ageing = page.getByRole('region', { name: 'Failures as vehicles age' });
    const mcf = ageing.getByRole('img', { name: /^Mean cumulative function of this group against the rest of the high exposure band/ });
    await expect.poll(() => mcf.locator('.recharts-line').count(), { timeout: 20_000 }).toBe(6);
    await mcf.getByText('Years in service', { exact: true }).waitFor();
    await mcf.getByText('Failures per vehicle', { exact: true }).waitFor();
    const box = (await mcf.locator('.recharts-cartesian-grid').boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.4, box.y + box.height / 2);
    await page.getByText(/^At [\d.]+ years in service$/).waitFor();
    expect(await mcf.locator('.recharts-tooltip-wrapper').textContent()).toMatch(/This group .*: [\d.]+ failures per vehicle \(95% [\d.]+–[\d.]+\), \d+ vehicles observed/);
    await ageing.getByRole('button', { name: 'All WLR-2 by exposure band' }).click();
    await ageing.getByRole('img', { name: /^Mean cumulative function by exposure band/ }).waitFor();
    await ageing.getByRole('button', { name: 'This group against the rest of its band' }).click();
  });

  it('says what the failures were, and a count opens the failures list filtered to it', async () => {
    const page = h.page;
    const breakdown = page.getByRole('region', { name: 'What the failures were' });
    const causes = breakdown.getByRole('table', { name: 'By root cause' });
    await causes.waitFor();
    const byCause = Object.fromEntries(
      (await columnTexts(causes, /^Root cause$/)).map((label, i) => [label.replace(/part fault$/, '').trim(), i]),
    ) as Record<string, number>;
    const counts = await columnTexts(causes, /^Failures$/);
    // Independently, from the stored defects of the record's failures.
    const rows = db
      .prepare(`select coalesce(root_cause, 'none') as cause, count(*) as n from defects where id in (select value from json_each(?)) group by 1`)
      .all(JSON.stringify(snap().cohort.failureIds)) as { cause: string; n: number }[];
    const connector = rows.find((r) => r.cause === 'connector')!.n;
    expect(Number(counts[byCause['Connector']!])).toBe(connector);
    expect(counts.reduce((s, c) => s + Number(c), 0)).toBe(snap().cohort.failureIds.length);
    await causes.getByRole('button', { name: /^Connector: show the / }).click();
    const failures = page.getByRole('table', { name: 'Failures behind this pattern' });
    await expect.poll(() => bodyRows(failures).count()).toBe(connector);
    expect(new Set(await columnTexts(failures, /^Root cause$/))).toEqual(new Set(['Connector']));
    await page.getByRole('button', { name: 'Show all failures' }).click();
    await expect.poll(() => bodyRows(failures).count()).toBe(snap().cohort.failureIds.length);
    expect(await failures.locator('tbody a[href^="/defects/"]').count()).toBe(snap().cohort.failureIds.length);
  });

  it('plans a campaign: a past target date is refused in the form, then the status and history show it', async () => {
    const page = h.page;
    await page.getByRole('button', { name: 'Plan a campaign' }).click();
    const dialog = page.getByRole('dialog', { name: /^Plan a campaign: WLR-2/ });
    await dialog.waitFor();
    await dialog.getByRole('button', { name: 'Save the campaign' }).click();
    await dialog.getByText('Say what the campaign does (at least 3 characters)').waitFor();
    await dialog.getByLabel('Campaign', { exact: false }).first().selectOption('new_membranes');
    await dialog.getByLabel(/^What the campaign does/).fill('Fit new membranes and clear the drain holes on every cohort van at GHQ and SMP');
    await dialog.getByLabel(/^Target date/).fill('2019-01-01');
    await dialog.getByRole('button', { name: 'Save the campaign' }).click();
    await dialog.getByText(/^The target date must be today \(.+\) or later$/).waitFor();
    expect((db.prepare('select status from pattern_records where id = ?').get(patternId()) as { status: string }).status).toBe('new');
    await dialog.getByLabel(/^Target date/).fill('2027-02-28');
    await dialog.getByRole('button', { name: 'Save the campaign' }).click();
    await dialog.waitFor({ state: 'hidden' });

    const status = page.getByRole('region', { name: 'Status' });
    await status.getByText('Fit new door membranes and seals').waitFor();
    expect(await status.textContent()).toContain('Campaign in force');
    expect(await status.textContent()).toContain(`by ${demoUser('manager').name}`);
    const history = page.getByRole('region', { name: 'History' });
    await history.getByText('New → Campaign planned').waitFor();

    const row = db.prepare('select status, campaign_kind as kind, campaign_target_date as target from pattern_records where id = ?').get(patternId());
    expect(row).toEqual({ status: 'campaign_planned', kind: 'new_membranes', target: '2027-02-28' });
    const audit = db.prepare("select count(*) as n from audit_log where entity = 'pattern' and entity_id = ? and action = 'status'").get(String(patternId())) as { n: number };
    expect(audit.n).toBe(4); // status, campaign kind, note and target date
  });

  it('revising the campaign records one "campaign revised" entry with only the changed date', async () => {
    const page = h.page;
    await page.getByRole('button', { name: 'Change the campaign' }).click();
    const dialog = page.getByRole('dialog', { name: /^Change the campaign: WLR-2/ });
    await dialog.getByRole('button', { name: 'Save the changes' }).click();
    await dialog.getByText(/^Nothing changed/).waitFor();
    const target = daysAhead(120);
    await dialog.getByLabel(/^Target date/).fill(target);
    await dialog.getByRole('button', { name: 'Save the changes' }).click();
    await dialog.waitFor({ state: 'hidden' });
    const entry = page.getByRole('region', { name: 'History' }).getByRole('listitem').filter({ hasText: 'Campaign revised' });
    await entry.waitFor();
    expect(await entry.textContent()).toContain('Target date');
    expect(await entry.textContent()).not.toMatch(/What it does|Campaign planned → Campaign planned/);
    const rows = db.prepare("select action, field from audit_log where entity = 'pattern' and entity_id = ? and action = 'campaign_revised'").all(String(patternId()));
    expect(rows).toEqual([{ action: 'campaign_revised', field: 'campaignTargetDate' }]);
  });

  it('opens the printable evidence pack: breakdown, both ratios, running header and footer in print', async () => {
    const page = h.page;
    await page.getByRole('link', { name: 'Open the evidence pack' }).click();
    await page.waitForURL((u) => u.pathname === `${patternPath}/evidence`);
    await page.getByRole('heading', { level: 1, name: /^WLR-2 .* built Oct 2022 – Mar 2023/ }).waitFor();
    expect(await page.getByText(`${demoUser('manager').name} (Fleet manager)`).count()).toBeGreaterThan(0);
    for (const name of ['Method in brief', 'Hall-sensor trace verdicts', 'What counts as a failure, and what the failures were', 'The statistics behind the finding', 'Are failures coming faster as the vehicles age?']) {
      await page.getByRole('heading', { name }).waitFor();
    }
    expect(await page.getByText(/^Campaign in force: Fit new door membranes and seals, target /).count()).toBe(1);
    await page.getByText(/^Two ratios\./).waitFor();
    await expect.poll(() => page.locator('.ev-chart .recharts-bar-rectangle').count()).toBeGreaterThan(10);
    // The rate chart's expectation line, then the MCF: the group and the rest of its band, each with two limits.
    await expect.poll(() => page.locator('.ev-chart').nth(0).locator('.recharts-line').count()).toBe(1);
    await expect.poll(() => page.locator('.ev-chart').nth(1).locator('.recharts-line').count()).toBe(6);
    const failures = (db.prepare('select failures from pattern_records where id = ?').get(patternId()) as { failures: number }).failures;
    const defects = page.getByRole('table', { name: 'Defects of the pattern' });
    expect(await bodyRows(defects).count()).toBe(failures);
    expect(await defects.locator('thead th', { hasText: 'Action' }).count()).toBe(1);
    expect(await defects.locator('tbody td.ev-action').count()).toBe(failures);
    expect(await page.locator('article').textContent()).not.toMatch(/docs\/|\.md\b/);
    // Printed: no navigation, no buttons; a running header and footer naming the pattern on every page.
    const head = page.locator('thead.ev-running');
    expect(await head.isVisible()).toBe(false);
    await page.emulateMedia({ media: 'print' });
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false);
    expect(await page.getByRole('button', { name: 'Print or save as PDF' }).isVisible()).toBe(false);
    expect(await head.isVisible()).toBe(true);
    expect(await head.textContent()).toContain(`Pattern ${patternId()} · WLR-2 · High exposure · built Oct 2022 – Mar 2023`);
    expect(await page.locator('tfoot.ev-running').isVisible()).toBe(true);
    const pdf = await page.pdf({ preferCSSPageSize: true });
    // A4 pages: several of them.
    expect((pdf.toString('latin1').match(/\/Type\s*\/Page\b/g) ?? []).length).toBeGreaterThan(2);
    await page.emulateMedia({ media: 'screen' });
  });

  it('the method is a page of its own', async () => {
    const page = h.page;
    await open(page, '/patterns/method');
    await page.getByRole('heading', { level: 1, name: 'How Seepline finds patterns' }).waitFor();
    await page.getByRole('heading', { name: '5. Two ways of saying "how much more often"' }).waitFor();
    expect(await page.locator('main').textContent()).not.toMatch(REPO_PATH);
  });

  it('a group that is not flagged opens read only, with why it is not flagged', async () => {
    const page = h.page;
    await open(page, '/patterns?all=1');
    await waitForPatterns(page);
    const weak = bodyRows(table(page)).filter({ hasText: 'Not significant' }).first();
    await weak.getByRole('link').first().click();
    await page.waitForURL((u) => u.pathname === '/patterns/group');
    await page.getByRole('region', { name: 'Why it is not flagged' }).getByText(/^Could well be chance/).waitFor();
    await page.getByText('Group of the report · read only').waitFor();
    for (const name of ['Plan a campaign', 'Acknowledge', 'Dismiss']) expect(await page.getByRole('button', { name }).count()).toBe(0);
    await page.getByRole('table', { name: 'Failures behind this group' }).waitFor();
  });

  it('the report as of a past day hides groups that are not flagged, says statuses are today’s, and rows open that day’s group', async () => {
    const page = h.page;
    await open(page, '/patterns?asOf=2025-06-30');
    await waitForPatterns(page);
    await page.getByText(/^Figures as the data stood on 30 Jun 2025/).waitFor();
    expect(new Set(await columnTexts(table(page), /^Verdict$/)).has('Not significant')).toBe(false);
    const statuses = await columnTexts(table(page), /^Status today$/);
    expect(statuses.filter((s) => s !== 'No record').every((s) => s.startsWith('Today: '))).toBe(true);
    await bodyRows(table(page)).first().getByRole('link').first().click();
    await page.waitForURL((u) => u.pathname === '/patterns/group' && u.searchParams.get('asOf') === '2025-06-30');
    await page.getByText(/^Figures as of 30 Jun 2025 over every depot/).waitFor();
    const rec = page.getByRole('region', { name: 'Pattern record' });
    await rec.getByRole('link', { name: /^Open pattern \d+$/ }).waitFor();
    await page.getByRole('link', { name: 'Patterns as of 30 Jun 2025' }).waitFor();
  });

  it('Refresh records says what it found', async () => {
    const page = h.page;
    await open(page, '/patterns');
    await waitForPatterns(page);
    await page.getByText(/^Records (updated|up to date)/).waitFor();
    await page.getByRole('button', { name: 'Refresh records' }).click();
    await page.getByText(/^Checked at \d\d:\d\d: (nothing new since the records were last updated|\d+ new patterns?, \d+ records? refreshed)/).waitFor();
  });
});

/** The record's snapshot as stored (its cohort's failures and build months). */
function snap(): { cohort: { failureIds: number[]; byMonth: { month: string }[] } } {
  return JSON.parse((db.prepare('select snapshot from pattern_records where id = ?').get(patternId()) as { snapshot: string }).snapshot);
}

describe('Patterns as depot supervisor', () => {
  beforeAll(async () => loginAs(h.context, 'supervisor'));

  it('reads the pattern with the figures of their depot only, without actions, and is sent back from the evidence pack', async () => {
    const page = h.page;
    await open(page, '/patterns');
    await waitForPatterns(page);
    await page.getByText(/^Figures cover your depots only \(GHQ\)/).waitFor();
    expect(await page.getByRole('button', { name: 'Refresh records' }).count()).toBe(0);
    await open(page, patternPath);
    const why = page.getByRole('region', { name: 'Why it is flagged' });
    await why.getByText(/^Fleet managers found this pattern on the whole fleet/).waitFor();
    await page.getByText('Read only: fleet managers and admins decide what to do about a pattern.').waitFor();
    for (const name of ['Plan a campaign', 'Acknowledge', 'Dismiss', 'Mark resolved', 'Change the campaign']) expect(await page.getByRole('button', { name }).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Open the evidence pack' }).count()).toBe(0);
    // Every vehicle and failure listed is GHQ's, and the headline counts exactly those — not the fleet's.
    const vehicles = page.getByRole('table', { name: 'Vehicles in this pattern' });
    const depots = await columnTexts(vehicles, /^Depot$/);
    expect(depots.length).toBeGreaterThan(0);
    expect(new Set(depots)).toEqual(new Set(['GHQ']));
    const failures = page.getByRole('table', { name: 'Failures behind this pattern' });
    const defectDepots = await failures.evaluate((t) => [...t.querySelectorAll('tbody tr td:nth-child(2) .text-xs')].map((e) => e.textContent));
    expect(new Set(defectDepots)).toEqual(new Set(['GHQ']));
    const ghqFailures = defectDepots.length;
    const ghq = (db.prepare("select id from depots where code = 'GHQ'").get() as { id: number }).id;
    const expectedGhq = (db
      .prepare("select count(*) as n from defects d join vehicles v on v.id = d.vehicle_id where d.id in (select value from json_each(?)) and d.depot_id = ? and v.depot_id = ?")
      .get(JSON.stringify(snap().cohort.failureIds), ghq, ghq) as { n: number }).n;
    expect(ghqFailures).toBe(expectedGhq);
    expect(ghqFailures).toBeLessThan(snap().cohort.failureIds.length);
    await why.getByText(new RegExp(`Every figure on this page counts only your depots \\(GHQ\\): \\d+ vehicles of the group and ${ghqFailures} failures reported there`)).waitFor();
    expect(await why.textContent()).toContain("at your depots' rate for WLR-2");
    await open(page, `${patternPath}/evidence`);
    await page.waitForURL((u) => u.pathname === patternPath);
  });

  it('the Overview lists the pattern with the failures of their depots, labelled so', async () => {
    const page = h.page;
    await open(page, '/');
    const section = page.getByRole('table', { name: 'Open patterns, those needing a look first' });
    await section.waitFor();
    expect(await section.locator('thead').textContent()).toContain('Failures in your depots');
    const row = bodyRows(section).filter({ hasText: 'WLR-2' });
    expect(await row.textContent()).toMatch(/\d+ vs [\d.]+on \d+ vehicles/);
  });
});

describe('an overdue campaign', () => {
  beforeAll(async () => loginAs(h.context, 'manager'));

  it('shows on the pattern page, the Patterns table and the Overview', async () => {
    // Time passes: the campaign's target date is now behind us (written as a person would see it weeks later).
    const rw = new Database(E2E_DB_PATH, { fileMustExist: true });
    try {
      rw.prepare("update pattern_records set campaign_target_date = '2025-01-31' where id = ?").run(patternId());
    } finally {
      rw.close();
    }
    const page = h.page;
    await open(page, patternPath);
    const status = page.getByRole('region', { name: 'Status' });
    await status.getByText('Overdue', { exact: true }).waitFor();
    await status.getByText(/Target date 31 Jan 2025 — passed, and the campaign is not resolved/).waitFor();
    await open(page, '/patterns');
    await waitForPatterns(page);
    await bodyRows(table(page)).filter({ hasText: 'WLR-2' }).first().getByText('Campaign overdue').waitFor();
    await open(page, '/');
    const overview = page.getByRole('table', { name: 'Open patterns, those needing a look first' });
    await bodyRows(overview).filter({ hasText: 'WLR-2' }).getByText('Campaign overdue').waitFor();
    await page.getByText(/1 campaign overdue/).waitFor();
  });
});

describe('Patterns on a 768 px tablet', () => {
  beforeAll(async () => {
    await loginAs(h.context, 'manager');
    await h.page.setViewportSize({ width: 768, height: 1024 });
  });
  afterAll(async () => h.page.setViewportSize({ width: 1280, height: 900 }));

  it('the table, the pattern page, a group page and the method fit the width, with tap-sized controls', async () => {
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
    const count = page.getByRole('table', { name: 'By root cause' }).getByRole('button').first();
    expect((await count.boundingBox())!.height).toBeGreaterThanOrEqual(40);

    await open(page, '/patterns/group?module=WLR-3&band=low');
    await page.getByRole('region', { name: /^Why it is (not )?flagged$/ }).waitFor();
    expect(await overflowPx(page)).toBeLessThanOrEqual(1);
    await open(page, '/patterns/method');
    await page.getByRole('heading', { level: 1, name: 'How Seepline finds patterns' }).waitFor();
    expect(await overflowPx(page)).toBeLessThanOrEqual(1);
  });
});
