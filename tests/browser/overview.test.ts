// The Overview in the browser: its figures against the database the server runs on, figures and chart
// elements opening the Defects list with the matching filter and count, what each role sees, and 768 px.
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoUser, E2E_DB_PATH, loginAs, open, pathOf, useBrowser } from './fixtures';

const h = useBrowser();
let db: Database.Database;
beforeAll(() => {
  db = new Database(E2E_DB_PATH, { readonly: true, fileMustExist: true });
});
afterAll(() => db?.close());

const OPEN = "('reported','diagnosing','awaiting_parts','repaired','verified')";
const fmt = (n: number) => n.toLocaleString('en-GB');
function count(sql: string, ...params: (string | number)[]): number {
  return (db.prepare(sql).get(...params) as { n: number }).n;
}
const countDefects = (where: string, ...params: (string | number)[]) =>
  count(`select count(*) as n from defects x join depots d on d.id = x.depot_id join modules m on m.id = x.module_id where ${where}`, ...params);

async function overview(page: Page): Promise<void> {
  await open(page, '/');
  await page.getByRole('heading', { level: 1, name: 'Overview' }).waitFor();
  // Charts draw once the island has measured its boxes.
  await page.getByRole('figure', { name: 'Open defects by depot and status' }).locator('svg').first().waitFor();
}

/** The Defects list's count line once the list has loaded. */
async function listCount(page: Page): Promise<string> {
  await page.waitForURL((u) => u.pathname === '/defects');
  const table = page.getByRole('table', { name: 'Defects', exact: true });
  await expect.poll(async () => (await table.getAttribute('aria-busy')) === 'false').toBe(true);
  return (await page.getByTestId('defect-count').textContent()) ?? '';
}
const matchLine = (n: number) => `${fmt(n)} ${n === 1 ? 'defect matches' : 'defects match'} this view`;
const figure = async (page: Page, id: string) => Number(((await page.getByTestId(`${id}-value`).textContent()) ?? '').replace(/[,%]/g, ''));

describe('Overview as fleet manager', () => {
  beforeAll(async () => loginAs(h.context, 'manager'));

  it('shows open work, off-road vehicles and stale work for every depot', async () => {
    const page = h.page;
    await overview(page);
    expect(await figure(page, 'kpi-open')).toBe(countDefects(`x.status in ${OPEN}`));
    expect(await figure(page, 'kpi-offroad')).toBe(count('select count(*) as n from vehicles where retired_date is null and off_road_since_at is not null'));
    expect(await page.getByRole('heading', { name: 'Depot comparison' }).count()).toBe(1);
    const depotBars = page.getByRole('figure', { name: /^Repeat rate by depot, / }).getByRole('link');
    expect(await depotBars.count()).toBe(count('select count(*) as n from depots'));
  });

  it('a figure opens the list with its filter and the same count', async () => {
    const page = h.page;
    await overview(page);
    const stale = await figure(page, 'kpi-stale');
    expect(stale).toBeGreaterThan(0);
    await page.getByTestId('kpi-stale').click();
    expect(await listCount(page)).toBe(matchLine(stale));
    expect(pathOf(page)).toBe('/defects?open=1&olderThanDays=30&sort=reportedAt');
  });

  it('the off-road figure opens the Vehicles list with the same count', async () => {
    const page = h.page;
    await overview(page);
    const offRoad = await figure(page, 'kpi-offroad');
    expect(offRoad).toBeGreaterThan(0);
    await page.getByTestId('kpi-offroad').click();
    await page.waitForURL((u) => u.pathname === '/vehicles');
    // Longest off road first.
    expect(pathOf(page)).toBe('/vehicles?status=off_road&sort=offRoadSince');
    await page.getByText(`${fmt(offRoad)} ${offRoad === 1 ? 'vehicle matches' : 'vehicles match'} these filters`).waitFor();
  });

  it('a segment of the status-by-depot chart opens that depot\'s defects in that status', async () => {
    const page = h.page;
    await overview(page);
    const n = countDefects("d.code = 'GHQ' and x.status = 'awaiting_parts'");
    expect(n).toBeGreaterThan(0);
    const segment = page.getByRole('figure', { name: 'Open defects by depot and status' }).getByRole('link', { name: `GHQ, Awaiting parts: ${n} open` });
    await segment.click();
    expect(await listCount(page)).toBe(matchLine(n));
    expect(pathOf(page)).toBe('/defects?depot=GHQ&status=awaiting_parts');
  });

  it('a point of the repeat trend opens that month\'s repeats', async () => {
    const page = h.page;
    await overview(page);
    const points = page.getByRole('figure', { name: /^Repeat rate by month, / }).getByRole('link', { name: /: [1-9]\d* repeats? of / });
    expect(await points.count()).toBeGreaterThan(0);
    const point = points.last();
    const label = (await point.getAttribute('aria-label'))!;
    const repeats = Number(/: (\d+) repeats? of/.exec(label)![1]);
    await point.click();
    expect(await listCount(page)).toBe(matchLine(repeats));
    const u = new URL(page.url());
    expect(u.searchParams.get('repeat')).toBe('1');
    const from = u.searchParams.get('reportedFrom')!;
    const to = u.searchParams.get('reportedTo')!;
    expect(from).toMatch(/^\d{4}-\d{2}-01$/);
    const independent = countDefects('x.repeat_of_id is not null and x.reported_at >= ? and x.reported_at < ?', Date.parse(`${from}T00:00:00Z`), Date.parse(`${to}T00:00:00Z`) + 86_400_000);
    expect(repeats).toBe(independent);
  });

  it('names its window exactly and marks the month still running as partial', async () => {
    const page = h.page;
    await overview(page);
    // The window: the eleven calendar months before this one, and this one so far (UTC).
    const now = new Date();
    const first = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 11, 1));
    const mon = (d: Date) => d.toLocaleString('en-GB', { month: 'short', timeZone: 'UTC' }).slice(0, 3);
    const span =
      first.getUTCFullYear() === now.getUTCFullYear()
        ? `${mon(first)} – ${mon(now)} ${now.getUTCFullYear()}`
        : `${mon(first)} ${first.getUTCFullYear()} – ${mon(now)} ${now.getUTCFullYear()}`;
    expect(await page.getByTestId('kpi-repeat').textContent()).toContain(`${span}, this month so far`);
    await page.getByRole('figure', { name: `Repeat rate by month, ${span}` }).waitFor();
    await page.getByText(/is still running(: its point counts \d+ defects? reported so far, not a whole month|, with no defect reported yet, so it has no point)\./).waitFor();
    const soFar = page.getByRole('figure', { name: /^Repeat rate by month, / }).getByRole('link', { name: /\(so far\):/ });
    expect(await soFar.count()).toBeLessThanOrEqual(1);
  });

  it('the repeats of the top module type open from its bar', async () => {
    const page = h.page;
    await overview(page);
    const bars = page.getByRole('figure', { name: /^Module types with the most defects, / }).getByRole('link', { name: /: [1-9]\d* repeats? since / });
    const bar = bars.first();
    const label = (await bar.getAttribute('aria-label'))!;
    const [, code, n] = /^(\S+): (\d+) repeats? since/.exec(label)!;
    await bar.click();
    expect(await listCount(page)).toBe(matchLine(Number(n)));
    expect(pathOf(page)).toMatch(new RegExp(`^/defects\\?module=${code}&repeat=1&reportedFrom=\\d{4}-\\d{2}-01$`));
  });
});

describe('Overview per role', () => {
  it('a technician sees their own open work first', async () => {
    const page = h.page;
    await loginAs(h.context, 'technician');
    await overview(page);
    const id = (db.prepare('select id from users where email = ?').get(demoUser('technician').email) as { id: number }).id;
    const mine = countDefects(`x.status in ${OPEN} and (x.assigned_to_id = ? or x.reported_by_id = ?)`, id, id);
    expect(await figure(page, 'kpi-mine')).toBe(mine);
    const myWork = await page.getByRole('heading', { name: 'My open work' }).boundingBox();
    const figures = await page.getByRole('region', { name: 'Key figures' }).boundingBox();
    expect(myWork!.y).toBeLessThan(figures!.y);
    expect(await page.getByRole('heading', { name: 'Depot comparison' }).count()).toBe(0);
    await page.getByTestId('mine-all').click();
    expect(await listCount(page)).toBe(matchLine(mine));
    expect(pathOf(page)).toBe('/defects?mine=1&open=1');
  });

  it('a supervisor sees their depot only', async () => {
    const page = h.page;
    await loginAs(h.context, 'supervisor');
    await overview(page);
    expect(await page.getByText('Gullhaven Quay (GHQ)').count()).toBeGreaterThan(0);
    expect(await figure(page, 'kpi-open')).toBe(countDefects(`d.code = 'GHQ' and x.status in ${OPEN}`));
    const rows = page.getByRole('table', { name: /^Repeats by depot, / }).locator('tbody tr');
    expect(await rows.count()).toBe(1);
    expect(await page.getByRole('heading', { name: 'My open work' }).count()).toBe(0);
    expect(await page.getByRole('heading', { name: 'Depot comparison' }).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Report a defect' }).count()).toBe(1);
  });

  it('a viewer reads their depots without any action', async () => {
    const page = h.page;
    await loginAs(h.context, 'viewer');
    await overview(page);
    const codes = demoUser('viewer').depots;
    expect(await page.getByText('read only', { exact: false }).count()).toBeGreaterThan(0);
    expect(await page.getByRole('link', { name: 'Report a defect' }).count()).toBe(0);
    const depotCells = await page.getByRole('table', { name: /^Repeats by depot, / }).locator('tbody tr td:first-child span.font-semibold').allTextContents();
    expect(depotCells.sort()).toEqual([...codes].sort());
    expect(await figure(page, 'kpi-open')).toBe(countDefects(`d.code in (${codes.map(() => '?').join(',')}) and x.status in ${OPEN}`, ...codes));
  });
});

describe('Overview at 768 px', () => {
  it('fits the tablet width and draws its charts', async () => {
    const page = h.page;
    await loginAs(h.context, 'manager');
    await page.setViewportSize({ width: 768, height: 1024 });
    await overview(page);
    expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(1);
    for (const name of [/^Repeat rate by month, /, /^Module types with the most defects, /, /^Repeat rate by depot, /]) {
      // The chart's own surface is its widest SVG (legend icons are small ones).
      const box = await page
        .getByRole('figure', { name })
        .locator('svg')
        .evaluateAll((els) => els.map((e) => e.getBoundingClientRect()).reduce((a, b) => (b.width > a.width ? b : a)))
        .then((r) => ({ x: r.x, width: r.width }));
      expect(box.width, String(name)).toBeGreaterThan(300);
      expect(box.x + box.width, String(name)).toBeLessThanOrEqual(768);
    }
    await page.setViewportSize({ width: 1280, height: 900 });
  });
});
