// The Vehicles list as a fleet manager (every depot) and as the GHQ depot supervisor (GHQ only): counts,
// paging, filters kept in the URL, and a vehicle's own page with its defect history.
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { bodyRows, columnTexts, E2E_DB_PATH, loginAs, open, pathOf, useBrowser } from './fixtures';

const h = useBrowser();
let db: Database.Database;
beforeAll(() => {
  db = new Database(E2E_DB_PATH, { readonly: true, fileMustExist: true });
});
afterAll(() => db?.close());

/** Counts straight from the database the server runs on (an independent check of what the page shows). */
function countVehicles(where = '1 = 1', ...params: string[]): number {
  return (db.prepare(`select count(*) as n from vehicles v join depots d on d.id = v.depot_id where ${where}`).get(...params) as { n: number }).n;
}
function countDefects(vin: string): number {
  return (db.prepare('select count(*) as n from defects x join vehicles v on v.id = x.vehicle_id where v.vin = ?').get(vin) as { n: number }).n;
}
const fmt = (n: number) => n.toLocaleString('en-GB');

const table = (page: Page) => page.getByRole('table', { name: 'Vehicles', exact: true });

/** Wait until the list has loaded (not busy) and shows `rows` body rows. */
async function waitForRows(page: Page, rows: number): Promise<void> {
  await expect.poll(async () => (await table(page).getAttribute('aria-busy')) === 'false' && (await bodyRows(table(page)).count()) === rows).toBe(true);
}

/** The count line under the heading, once it has loaded. */
async function countLine(page: Page): Promise<string> {
  const line = page.getByText(/^[\d,]+ vehicles? (in your depots|match(es)? these filters)$/);
  await line.waitFor();
  return (await line.textContent()) ?? '';
}

/** Each row's fleet number (the link in the "Fleet no." column, or the first link of the compact "Vehicle" column). */
async function fleetNumbers(page: Page): Promise<string[]> {
  return columnTexts(table(page), /^(Fleet no\.|Vehicle)$/, { firstLink: true });
}
async function depotCodes(page: Page): Promise<string[]> {
  return (await columnTexts(table(page), /^Depot/)).map((t) => t.split('\n')[0]!.trim());
}

/** Choose an option of a labelled select, then wait for the list to settle. */
async function choose(page: Page, label: string, value: string): Promise<void> {
  await page.getByRole('search', { name: 'Filter vehicles' }).getByLabel(label, { exact: true }).selectOption(value);
}

/** Sort by open defects, most first, open the top vehicle and check its page and defect history. */
async function openBusiestVehicle(page: Page, depotCode?: string): Promise<void> {
  const openHeader = table(page).locator('thead').getByRole('button', { name: /^Open/ });
  await openHeader.click();
  await expect.poll(() => pathOf(page)).toContain('sort=openDefects');
  await openHeader.click();
  await expect.poll(() => pathOf(page)).toContain('sort=-openDefects');
  await expect.poll(async () => (await table(page).getAttribute('aria-busy')) === 'false').toBe(true);
  const first = bodyRows(table(page)).first();
  const fleetNo = (await fleetNumbers(page))[0]!;
  await first.getByRole('link', { name: fleetNo, exact: true }).click();
  await page.waitForURL((u) => u.pathname.startsWith('/vehicles/'));

  const vin = decodeURIComponent(new URL(page.url()).pathname.split('/')[2]!);
  const defects = countDefects(vin);
  expect(defects, 'the busiest vehicle has defects').toBeGreaterThan(0);
  expect(await page.getByTestId('vin').textContent()).toBe(vin);
  expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain(fleetNo);
  if (depotCode) {
    const depotSection = page.getByRole('region', { name: 'Depot', exact: true });
    expect(await depotSection.textContent()).toContain(depotCode);
  }
  await page.getByRole('heading', { name: 'Defect history' }).waitFor();
  const history = page.getByRole('table', { name: `Defect history of ${fleetNo}` });
  expect(await bodyRows(history).count()).toBe(Math.min(defects, 200));
  // Every history row links to its defect.
  expect(await history.locator('tbody').getByRole('link', { name: /^[A-Z]/ }).count()).toBeGreaterThanOrEqual(Math.min(defects, 200));
}

describe('Vehicles as fleet manager', () => {
  beforeAll(async () => loginAs(h.context, 'manager'));

  it('lists the first 50 of every vehicle and pages on to different rows', async () => {
    const page = h.page;
    const total = countVehicles();
    expect(total).toBeGreaterThan(100);
    await open(page, '/vehicles');
    await page.getByRole('heading', { level: 1, name: 'Vehicles' }).waitFor();
    await waitForRows(page, 50);
    expect(await countLine(page)).toBe(`${fmt(total)} vehicles in your depots`);
    await page.getByText(`1–50 of ${fmt(total)}`).waitFor();
    const first = await fleetNumbers(page);
    expect(new Set(await depotCodes(page)).size).toBeGreaterThan(1);

    await page.getByRole('button', { name: 'Next', exact: true }).click();
    await page.getByText(`51–100 of ${fmt(total)}`).waitFor();
    await waitForRows(page, 50);
    expect(pathOf(page)).toContain('page=2');
    const second = await fleetNumbers(page);
    expect(second.filter((f) => first.includes(f))).toEqual([]);
    await page.getByText(`Page 2 of ${Math.ceil(total / 50)}`).waitFor();
  });

  it('filters by depot, parking and search; the URL follows and a reload keeps the filter', async () => {
    const page = h.page;
    await open(page, '/vehicles');
    await waitForRows(page, 50);

    const smp = countVehicles('d.code = ?', 'SMP');
    await choose(page, 'Depot', 'SMP');
    await expect.poll(() => pathOf(page)).toContain('depot=SMP');
    await page.getByText(`${fmt(smp)} vehicles match these filters`).waitFor();
    await waitForRows(page, Math.min(50, smp));
    expect(new Set(await depotCodes(page))).toEqual(new Set(['SMP']));

    const smpIndoor = countVehicles("d.code = ? and v.parking = 'indoor'", 'SMP');
    expect(smpIndoor).toBeGreaterThan(0);
    expect(smpIndoor).toBeLessThan(smp);
    await choose(page, 'Parking', 'indoor');
    await expect.poll(() => pathOf(page)).toContain('parking=indoor');
    expect(pathOf(page)).toContain('depot=SMP');
    await page.getByText(`${fmt(smpIndoor)} ${smpIndoor === 1 ? 'vehicle matches' : 'vehicles match'} these filters`).waitFor();
    await waitForRows(page, Math.min(50, smpIndoor));

    await page.reload();
    await waitForRows(page, Math.min(50, smpIndoor));
    expect(pathOf(page)).toContain('depot=SMP');
    expect(pathOf(page)).toContain('parking=indoor');
    expect(await countLine(page)).toBe(`${fmt(smpIndoor)} ${smpIndoor === 1 ? 'vehicle matches' : 'vehicles match'} these filters`);
    const filters = page.getByRole('search', { name: 'Filter vehicles' });
    expect(await filters.getByLabel('Depot', { exact: true }).inputValue()).toBe('SMP');
    expect(await filters.getByLabel('Parking', { exact: true }).inputValue()).toBe('indoor');
    expect(new Set(await depotCodes(page))).toEqual(new Set(['SMP']));

    // Back steps to the previous filter (depot only), Forward returns to depot and parking.
    await page.goBack();
    await expect.poll(() => pathOf(page)).not.toContain('parking=');
    expect(pathOf(page)).toContain('depot=SMP');
    await page.getByText(`${fmt(smp)} vehicles match these filters`).waitFor();
    expect(await filters.getByLabel('Parking', { exact: true }).inputValue()).toBe('');
    await page.goForward();
    await expect.poll(() => pathOf(page)).toContain('parking=indoor');
    await page.getByText(`${fmt(smpIndoor)} ${smpIndoor === 1 ? 'vehicle matches' : 'vehicles match'} these filters`).waitFor();

    // Search for one of the listed vehicles by its fleet number.
    await filters.getByRole('button', { name: 'Clear filters' }).click();
    await expect.poll(() => pathOf(page)).toBe('/vehicles');
    await waitForRows(page, 50);
    const target = (await fleetNumbers(page))[7]!;
    await filters.getByRole('searchbox', { name: 'Search' }).fill(target);
    await expect.poll(() => pathOf(page)).toContain(`q=${target}`);
    await page.getByText('1 vehicle matches these filters').waitFor();
    await waitForRows(page, 1);
    expect(await fleetNumbers(page)).toEqual([target]);
    await page.reload();
    await waitForRows(page, 1);
    expect(await filters.getByRole('searchbox', { name: 'Search' }).inputValue()).toBe(target);
  });

  it('opens a vehicle and shows its defect history', async () => {
    await open(h.page, '/vehicles');
    await waitForRows(h.page, 50);
    await openBusiestVehicle(h.page);
  });
});

describe('Vehicles as the GHQ depot supervisor', () => {
  beforeAll(async () => loginAs(h.context, 'supervisor'));

  it('lists only GHQ vehicles, on every page', async () => {
    const page = h.page;
    const ghq = countVehicles('d.code = ?', 'GHQ');
    expect(ghq).toBeGreaterThan(50);
    expect(ghq).toBeLessThan(countVehicles());
    await open(page, '/vehicles');
    await waitForRows(page, 50);
    expect(await countLine(page)).toBe(`${fmt(ghq)} vehicles in your depots`);
    expect(new Set(await depotCodes(page))).toEqual(new Set(['GHQ']));
    const first = await fleetNumbers(page);
    // One depot only: no depot picker.
    expect(await page.getByRole('search', { name: 'Filter vehicles' }).getByLabel('Depot', { exact: true }).count()).toBe(0);

    await page.getByRole('button', { name: 'Next', exact: true }).click();
    await page.getByText(`51–${fmt(Math.min(100, ghq))} of ${fmt(ghq)}`).waitFor();
    await waitForRows(page, Math.min(50, ghq - 50));
    expect(new Set(await depotCodes(page))).toEqual(new Set(['GHQ']));
    expect((await fleetNumbers(page)).filter((f) => first.includes(f))).toEqual([]);
  });

  it('filters by parking and search within GHQ, kept across a reload', async () => {
    const page = h.page;
    const outdoor = countVehicles("d.code = ? and v.parking = 'outdoor'", 'GHQ');
    await open(page, '/vehicles');
    await waitForRows(page, 50);
    await choose(page, 'Parking', 'outdoor');
    await expect.poll(() => pathOf(page)).toContain('parking=outdoor');
    await page.getByText(`${fmt(outdoor)} vehicles match these filters`).waitFor();
    await page.reload();
    await waitForRows(page, Math.min(50, outdoor));
    expect(await countLine(page)).toBe(`${fmt(outdoor)} vehicles match these filters`);
    expect(new Set(await depotCodes(page))).toEqual(new Set(['GHQ']));

    // A vehicle of another depot is not found by search …
    const smpFleetNo = (db.prepare("select v.fleet_number as f from vehicles v join depots d on d.id = v.depot_id where d.code = 'SMP' order by v.id limit 1").get() as { f: string }).f;
    await page.getByRole('search', { name: 'Filter vehicles' }).getByRole('searchbox', { name: 'Search' }).fill(smpFleetNo);
    await expect.poll(() => pathOf(page)).toContain(`q=${smpFleetNo}`);
    await page.getByText('No vehicles match these filters.').waitFor();
    expect(await countLine(page)).toBe('0 vehicles match these filters');
  });

  it("opens a GHQ vehicle with its history; another depot's vehicle is not found", async () => {
    const page = h.page;
    await open(page, '/vehicles');
    await waitForRows(page, 50);
    await openBusiestVehicle(page, 'GHQ');

    const smpVin = (db.prepare("select v.vin from vehicles v join depots d on d.id = v.depot_id where d.code = 'SMP' order by v.id limit 1").get() as { vin: string }).vin;
    h.guard.expectFailure(new RegExp(`/vehicles/${smpVin}$`), 404);
    const res = await page.goto(`${new URL(page.url()).origin}/vehicles/${smpVin}`);
    expect(res?.status()).toBe(404);
    await page.getByRole('heading', { level: 1, name: 'Vehicle not found' }).waitFor();
  });
});

describe('off road: how long, why, and going back into service', () => {
  beforeAll(async () => loginAs(h.context, 'supervisor'));

  /** A GHQ vehicle off road with an open window-lifter defect that lacks the release verification. */
  function unverifiedOffRoad(): { vin: string; fleet: string; ref: string } {
    return db
      .prepare(
        `select v.vin, v.fleet_number as fleet, x.ref from vehicles v join depots d on d.id = v.depot_id
           join defects x on x.vehicle_id = v.id join modules m on m.id = x.module_id
          where d.code = 'GHQ' and v.off_road_since_at is not null and v.retired_date is null
            and x.status in ('reported','diagnosing','awaiting_parts','repaired','verified')
            and m.function = 'window_lifter' and x.verified_at is null
          order by v.id limit 1`,
      )
      .get() as { vin: string; fleet: string; ref: string };
  }

  it('lists off-road vehicles with since when (in days) and the open defects keeping them off road', async () => {
    const page = h.page;
    const target = unverifiedOffRoad();
    expect(target, 'the demo has such a vehicle').toBeTruthy();
    const n = countVehicles("d.code = 'GHQ' and v.off_road_since_at is not null and v.retired_date is null");
    await open(page, '/vehicles?status=off_road&sort=offRoadSince');
    await waitForRows(page, Math.min(50, n));
    const row = bodyRows(table(page)).filter({ hasText: target.fleet });
    await expect.poll(async () => row.textContent()).toMatch(/since \d{2} \w{3,4} \d{4} · \d+ d/);
    await row.getByRole('link', { name: new RegExp(`${target.ref}.*needs the release verification`) }).waitFor();
  });

  it('asks for a reason and a confirmation before returning a vehicle with an unverified window-lifter defect, then shows it in the history', async () => {
    const page = h.page;
    const target = unverifiedOffRoad();
    await open(page, `/vehicles/${target.vin}`);
    expect(await page.getByTestId('vehicle-status').textContent()).toBe('Off road');
    await page.getByTestId('off-road-since').waitFor();
    await page.getByRole('button', { name: 'Return to service…' }).click();
    const dialog = page.getByRole('dialog', { name: `Return ${target.fleet} to service?` });
    await dialog.getByRole('alert').filter({ hasText: 'still needs the release verification' }).waitFor();
    expect(await dialog.getByRole('link', { name: target.ref }).count()).toBe(1);
    const confirm = dialog.getByRole('button', { name: 'Return to service', exact: true });
    // Nothing happens on one tap: the reason and the confirmation come first.
    expect(await confirm.isDisabled()).toBe(true);
    await dialog.getByLabel(/Why it can go back into service/).fill('Needed for the Saturday round; FR window secured shut');
    expect(await confirm.isDisabled()).toBe(true);
    await dialog.getByRole('checkbox', { name: new RegExp(`${target.ref} not verified`) }).check();
    await confirm.click();
    await expect.poll(async () => page.getByTestId('vehicle-status').textContent()).toBe('In service');
    const history = page.getByRole('table', { name: `Off-road history of ${target.fleet}` });
    await history.getByText('Needed for the Saturday round; FR window secured shut').waitFor();
    await history.getByText(`Released with ${target.ref} not verified`).waitFor();
    const audit = db.prepare("select field, new_value as v from audit_log where entity = 'vehicle' and entity_id = ? and field in ('offRoadReturnReason', 'releasedWithUnverified') order by id").all(target.vin);
    expect(audit).toEqual([
      { field: 'offRoadReturnReason', v: 'Needed for the Saturday round; FR window secured shut' },
      { field: 'releasedWithUnverified', v: target.ref },
    ]);
  });

  it('finds a vehicle by its registration typed without dashes or spaces', async () => {
    const page = h.page;
    const { reg, fleet } = db
      .prepare("select v.registration as reg, v.fleet_number as fleet from vehicles v join depots d on d.id = v.depot_id where d.code = 'GHQ' and v.registration like '%-%' order by v.id limit 1")
      .get() as { reg: string; fleet: string };
    const typed = reg.replace(/[-\s]/g, '');
    expect(typed).not.toBe(reg);
    await open(page, '/vehicles');
    await waitForRows(page, 50);
    await page.getByRole('search', { name: 'Filter vehicles' }).getByRole('searchbox', { name: 'Search' }).fill(typed.toLowerCase());
    await page.getByText('1 vehicle matches these filters').waitFor();
    expect(await fleetNumbers(page)).toEqual([fleet]);
  });
});

