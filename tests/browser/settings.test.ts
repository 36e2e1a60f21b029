// The Settings page: admins only; a bad window is refused on the form; a preview of a new repeat window says
// how many defects would change without writing anything (the other browser files share this database, so this
// file saves only the currency, and puts it back; the rest of saving is covered by tests/api/settings.test.ts).
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { E2E_DB_PATH, loginAs, open, pathOf, useBrowser } from './fixtures';
import { computeRepeats } from '../../src/lib/defects/repeat';

const h = useBrowser();
let db: Database.Database;
beforeAll(() => {
  db = new Database(E2E_DB_PATH, { readonly: true, fileMustExist: true });
});
afterAll(() => db?.close());

/** Defects whose repeat link a window of `days` would change, worked out from the rows with the repeat rule. */
function wouldChange(days: number): number {
  const rows = db
    .prepare(
      `select x.id, x.vehicle_id as vehicleId, x.position, m.function as moduleFunction, x.reported_at as reportedAt, x.closed_at as closedAt,
              x.status = 'cancelled' as cancelled, x.repeat_of_id as repeatOfId
       from defects x join modules m on m.id = x.module_id`,
    )
    .all() as Array<{ id: number; vehicleId: number; position: string; moduleFunction: string; reportedAt: number; closedAt: number | null; cancelled: number; repeatOfId: number | null }>;
  const links = computeRepeats(rows.map((r) => ({ ...r, cancelled: r.cancelled === 1 })), days);
  return rows.filter((r) => (links.get(r.id) ?? null) !== r.repeatOfId).length;
}

describe('Settings', () => {
  it('is for admins only: others are told so at the address they asked for (403)', async () => {
    await loginAs(h.context, 'manager');
    h.guard.expectFailure(/\/settings$/, 403);
    await open(h.page, '/settings');
    expect(pathOf(h.page)).toBe('/settings');
    await h.page.getByRole('heading', { level: 1, name: 'Settings is not open to your role' }).waitFor();
  });

  it('refuses a window that is not a whole number of days in range', async () => {
    const page = h.page;
    await loginAs(h.context, 'admin');
    await open(page, '/settings');
    const field = page.getByLabel('Window in days');
    await expect.poll(() => field.inputValue()).toBe('90');
    await field.fill('0');
    await page.getByRole('button', { name: 'Preview the effect' }).click();
    await page.getByText('Between 1 and 3,650 days.').waitFor();
    expect(await field.getAttribute('aria-invalid')).toBe('true');
  });

  it('previews a shorter window with the number of defects it would change, writing nothing', async () => {
    const page = h.page;
    await loginAs(h.context, 'admin');
    await open(page, '/settings');
    const field = page.getByLabel('Window in days');
    await expect.poll(() => field.inputValue()).toBe('90');
    const expected = wouldChange(45);
    expect(expected).toBeGreaterThan(0);
    await field.fill('45');
    await page.getByRole('button', { name: 'Preview the effect' }).click();
    const status = page.getByRole('status').filter({ hasText: 'Preview, nothing saved' });
    await status.waitFor();
    expect(await status.textContent()).toContain(`would change the repeat link of ${expected.toLocaleString('en-GB')} defects`);
    expect((db.prepare("select count(*) as n from settings where key = 'repeat_window_days'").get() as { n: number }).n).toBe(0);
    expect(wouldChange(90)).toBe(0);
    await page.getByText('No changes made here yet.').waitFor();
  });

  it('sets the currency of every amount, shows it on the labour rate, audits it, and is set back', async () => {
    const page = h.page;
    await loginAs(h.context, 'admin');
    await open(page, '/settings');
    const currency = page.getByLabel('Currency (ISO 4217)');
    await expect.poll(() => currency.inputValue()).toBe('GBP');
    const rate = (db.prepare("select value from settings where key = 'labour_rate_minor_per_hour'").get() as { value: string } | undefined)?.value;
    const amount = rate ? (Number(rate) / 100).toLocaleString('en-GB', { minimumFractionDigits: 2 }) : null;
    if (amount) await page.getByText(`In force: £${amount} an hour`).waitFor();
    expect(await page.getByLabel('Rate per hour (GBP)').count()).toBe(1);
    await currency.selectOption('EUR');
    await page.getByRole('button', { name: 'Save the currency' }).click();
    await page.getByRole('status').filter({ hasText: 'Amounts are now shown in EUR (€123.45 for example).' }).waitFor();
    if (amount) await page.getByText(`In force: €${amount} an hour`).waitFor();
    expect(db.prepare("select value from settings where key = 'currency'").get()).toEqual({ value: 'EUR' });
    await page.getByRole('cell', { name: 'Currency GBP → EUR' }).waitFor();
    // Back to the demo's currency for the other browser files.
    await currency.selectOption('GBP');
    await page.getByRole('button', { name: 'Save the currency' }).click();
    await page.getByRole('status').filter({ hasText: 'Amounts are now shown in GBP' }).waitFor();
    expect(db.prepare("select value from settings where key = 'currency'").get()).toEqual({ value: 'GBP' });
  });
});
