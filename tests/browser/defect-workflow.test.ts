// A defect from report to verified repair, as the GHQ technician does it: report it on a vehicle found by its
// fleet number, start the diagnosis, record findings, parts and a photo, mark it repaired, try to close it
// without the release verification (refused, with the reason on screen), record the verification, close it.
// The GHQ supervisor then finds it in the Defects list and sees it counted on the Overview. Then the same
// pages on a 768 px tablet.
import Database from 'better-sqlite3';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { baseUrl, demoUser, E2E_DB_PATH, loginAs, open, useBrowser } from './fixtures';

const h = useBrowser();
let db: Database.Database;
let vehicle: { vin: string; fleet: string };
let defectPath = '';
let ref = '';

beforeAll(() => {
  db = new Database(E2E_DB_PATH, { readonly: true, fileMustExist: true });
  // A GHQ vehicle in service with no defect on its rear-left door (so the new one is no repeat by chance).
  vehicle = db
    .prepare(
      `select v.vin, v.fleet_number as fleet from vehicles v join depots d on d.id = v.depot_id
       where d.code = 'GHQ' and v.retired_date is null
         and not exists (select 1 from defects x where x.vehicle_id = v.id and x.position = 'RL')
       order by v.id limit 1`,
    )
    .get() as { vin: string; fleet: string };
});
afterAll(() => db?.close());

/** Defects reported at GHQ since the start of a UTC day (an independent count from the database the server uses). */
function reportedAtGhqSince(day: string): number {
  return (db.prepare("select count(*) n from defects x join depots d on d.id = x.depot_id where d.code = 'GHQ' and x.reported_at >= ?").get(Date.parse(`${day}T00:00:00Z`)) as { n: number }).n;
}

const status = (page: Page) => page.getByTestId('defect-status');
async function step(page: Page, name: string | RegExp, expected: string) {
  await page.getByRole('group', { name: 'Next steps' }).getByRole('button', { name, exact: typeof name === 'string' }).click();
  await expect.poll(async () => (await status(page).textContent())?.trim()).toBe(expected);
}

describe('a technician works a window-lifter defect to a verified close', () => {
  beforeAll(async () => loginAs(h.context, 'technician'));

  it('reports the defect with the vehicle found by fleet number, the door on the plan and decoded fault codes', async () => {
    const page = h.page;
    await open(page, '/defects/new');
    await page.getByRole('heading', { level: 1, name: 'Report a defect' }).waitFor();
    const search = page.getByRole('combobox', { name: 'Vehicle' });
    await search.fill(vehicle.fleet);
    await page.getByRole('option', { name: new RegExp(vehicle.vin) }).click();
    await page.getByTestId('chosen-vehicle').getByText(vehicle.vin).waitFor();

    await page.getByRole('radio', { name: /^Rear left \(RL\)/ }).click();
    expect(await page.getByRole('radio', { name: /^Rear left \(RL\)/ }).getAttribute('aria-checked')).toBe('true');
    await page.getByLabel('Module type').selectOption('WLR-2');
    await page.getByRole('button', { name: '+ Window reverses when closing' }).click();
    expect(await page.getByRole('textbox', { name: 'Symptom' }).inputValue()).toBe('Window reverses when closing');

    // Live decoding: a valid code and its failure type, then a mistyped one.
    await page.getByRole('textbox', { name: 'Fault codes', exact: true }).fill('b1a21-29 B1A22-13');
    const decoded = page.getByRole('list', { name: 'Fault codes decoded' });
    await decoded.getByText('Body, manufacturer-specific · failure type 29: signal invalid (General Signal)').waitFor();
    await decoded.getByText('Body, manufacturer-specific · failure type 13: circuit open (General Electrical)').waitFor();
    await page.getByRole('textbox', { name: 'Fault codes', exact: true }).fill('B1A21-29 X1234');
    await decoded.getByText(/"X1234" is not a fault code/).waitFor();
    await page.getByRole('textbox', { name: 'Fault codes', exact: true }).fill('B1A21-29 B1A22-29');
    await page.getByRole('textbox', { name: 'Odometer, km' }).fill('61234');
    await page.getByRole('button', { name: 'Report defect' }).click();
    await page.waitForURL(/\/defects\/\d+$/);
    defectPath = new URL(page.url()).pathname;
    ref = ((await page.getByRole('heading', { level: 1 }).textContent()) ?? '').trim();
    expect(ref).toMatch(/^DF-\d{6}$/);

    const row = db.prepare('select d.status, d.position, d.dtcs, d.odometer_km, m.code from defects d join modules m on m.id = d.module_id where d.ref = ?').get(ref);
    expect(row).toEqual({ status: 'reported', position: 'RL', dtcs: 'B1A21-29 B1A22-29', odometer_km: 61234, code: 'WLR-2' });
    expect((await status(page).textContent())?.trim()).toBe('Reported');
    await page.getByRole('table', { name: `Fault codes of ${ref}, decoded` }).getByText('B1A22-29').waitFor();
  });

  it('starts the diagnosis and records findings, parts and labour', async () => {
    const page = h.page;
    await step(page, 'Start diagnosis', 'Diagnosing');
    await page.getByText(`Assigned to ${demoUser('technician').name}`).waitFor();

    const form = page.getByRole('form', { name: 'Diagnosis and repair record' });
    await page.getByTestId('diagnosis-card').getByTestId('safety-cautions').getByText(/Back-probe connectors/).waitFor();
    await form.getByRole('radio', { name: 'Corrosion' }).check();
    await form.getByLabel('Membrane').selectOption('damaged');
    await form.getByLabel('Drain holes').selectOption('blocked');
    await form.getByLabel('Connector').selectOption('corroded');
    await form.getByLabel('Root cause').selectOption('water_ingress');
    await form.getByLabel('Action (what was done)').fill('Replaced the window lifter motor, fitted a new membrane, cleared the drain holes');
    await form.getByRole('button', { name: 'Add a part' }).click();
    const line = form.getByTestId('part-line').first();
    await line.getByLabel('Part number').fill('CM-WL2-4471');
    await line.getByLabel('Description').fill('Window lifter motor gen 2');
    await line.getByLabel('Unit cost').fill('189.00');
    await form.getByLabel('Labour, minutes').fill('95');
    await form.getByRole('button', { name: 'Save diagnosis and repair' }).click();
    await form.getByRole('status').getByText(/^Saved at/).waitFor();
    const saved = db.prepare('select moisture, membrane_condition m, root_cause r, labour_minutes l from defects where ref = ?').get(ref);
    expect(saved).toEqual({ moisture: 'corrosion', m: 'damaged', r: 'water_ingress', l: 95 });
    expect(db.prepare('select part_number p, quantity q, unit_cost_minor c from defect_parts where defect_id = (select id from defects where ref = ?)').all(ref)).toEqual([{ p: 'CM-WL2-4471', q: 1, c: 18900 }]);
  });

  it('adds a photo taken on the tablet and opens it larger', async () => {
    const page = h.page;
    const photo = await sharp({ create: { width: 800, height: 600, channels: 3, background: { r: 60, g: 90, b: 40 } } })
      .jpeg()
      .withMetadata({ orientation: 6 })
      .withExifMerge({ IFD0: { Make: 'TabletCam' } })
      .toBuffer();
    const gallery = page.getByTestId('photo-gallery');
    await gallery.getByLabel(/^Caption/).fill('Corroded encoder board');
    await gallery.getByLabel('Choose files').setInputFiles({ name: 'IMG_2041.jpg', mimeType: 'image/jpeg', buffer: photo });
    await gallery.getByTestId('upload-outcomes').getByText('IMG_2041.jpg: Stored.').waitFor();
    const thumb = gallery.getByRole('button', { name: 'Open photo 1: Corroded encoder board' });
    await thumb.waitFor();
    await expect.poll(() => thumb.locator('img').evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(270);
    await thumb.click();
    const dialog = page.getByRole('dialog', { name: 'Corroded encoder board' });
    await expect.poll(() => dialog.getByRole('img').evaluate((img: HTMLImageElement) => img.complete && img.naturalHeight)).toBe(800);
    await dialog.getByRole('button', { name: 'Close' }).click();
    await dialog.waitFor({ state: 'hidden' });
  });

  it('marks it repaired, is refused closing without the release verification, verifies and closes', async () => {
    const page = h.page;
    await step(page, 'Mark repaired', 'Repaired');
    await page.getByTestId('next-step').getByText(/record that verification/).waitFor();

    // Closing a window lifter without the verification: the server refuses and the reason is shown.
    h.guard.expectFailure(/\/api\/defects\/\d+\/transitions$/, 422);
    await page.getByRole('group', { name: 'Next steps' }).getByRole('button', { name: 'Close', exact: true }).click();
    const closeDialog = page.getByRole('dialog', { name: `Close ${ref}` });
    await closeDialog.getByTestId('safety-cautions').getByText(/100 N limit on closing force/).waitFor();
    await closeDialog.getByRole('button', { name: 'Close defect' }).click();
    await closeDialog.getByRole('alert').getByText(/record the release verification before closing it/).waitFor();
    expect((await status(page).textContent())?.trim()).toBe('Repaired');
    await closeDialog.getByRole('button', { name: 'Back', exact: true }).click();

    await page.getByRole('group', { name: 'Next steps' }).getByRole('button', { name: 'Record verification' }).click();
    const verify = page.getByRole('dialog', { name: 'Record the release verification' });
    await verify.getByText('Seepline records them; it certifies nothing.', { exact: false }).waitFor();
    await verify.getByRole('button', { name: 'Record verification' }).click();
    await verify.getByRole('alert').getByText(/Tick both checks/).waitFor();
    await verify.getByLabel("The window has been re-initialised as the vehicle maker's procedure says").check();
    await verify.getByLabel('Automatic closing reverses on an obstruction').check();
    await verify.getByLabel(/How it was checked/).fill('Test rod at the top of travel');
    await verify.getByRole('button', { name: 'Record verification' }).click();
    await expect.poll(async () => (await status(page).textContent())?.trim()).toBe('Verified');
    await page.getByTestId('verification').getByText(demoUser('technician').name).waitFor();

    await page.getByRole('group', { name: 'Next steps' }).getByRole('button', { name: 'Close and release' }).click();
    await page.getByRole('dialog', { name: `Close ${ref}` }).getByRole('button', { name: 'Close defect' }).click();
    await expect.poll(async () => (await status(page).textContent())?.trim()).toBe('Closed');
    const row = db.prepare('select status, verified_reinit r, verified_reversal v, verified_by_id b, closed_at c from defects where ref = ?').get(ref) as Record<string, unknown>;
    expect(row).toMatchObject({ status: 'closed', r: 1, v: 1 });
    expect(row.c).not.toBeNull();
    // The timeline names every step; the audit trail has the verification and the status changes.
    await page.getByText('All status changes (4)').click();
    const steps = page.getByRole('list', { name: 'Status changes, oldest first' }).getByRole('listitem');
    expect(await steps.count()).toBe(4);
    await page.getByRole('table', { name: `Changes to ${ref}, newest first` }).getByText('Auto-reverse checked').waitFor();
    // A technician cannot change a closed record: the diagnosis is read only now.
    expect(await page.getByRole('button', { name: 'Save diagnosis and repair' }).count()).toBe(0);
  });
});

describe('two people change the same defect', () => {
  beforeAll(async () => loginAs(h.context, 'technician'));

  it('shows theirs against yours field by field instead of overwriting, and re-applies the chosen values', async () => {
    const target = db
      .prepare("select x.id from defects x join depots d on d.id = x.depot_id where d.code = 'GHQ' and x.status in ('diagnosing', 'awaiting_parts') order by x.id limit 1")
      .get() as { id: number };
    const page = h.page;
    await open(page, `/defects/${target.id}`);
    const mine = page.getByRole('form', { name: 'Diagnosis and repair record' });
    await mine.getByRole('radio', { name: 'Corrosion' }).check();
    await mine.getByLabel('Labour, minutes').fill('120');

    // Someone else (here: a second tab) saves moisture and notes first.
    const other = await h.context.newPage();
    await open(other, `/defects/${target.id}`);
    const theirs = other.getByRole('form', { name: 'Diagnosis and repair record' });
    await theirs.getByRole('radio', { name: 'Traces' }).check();
    await theirs.getByLabel('Notes').fill('Driver reports the window also squeaks');
    await theirs.getByRole('button', { name: 'Save diagnosis and repair' }).click();
    await theirs.getByRole('status').getByText(/^Saved at/).waitFor();
    await other.close();

    h.guard.expectFailure(/\/api\/defects\/\d+$/, 409);
    await mine.getByRole('button', { name: 'Save diagnosis and repair' }).click();
    const panel = page.getByRole('alert').filter({ hasText: 'Not saved: this defect was changed while you were editing' });
    await panel.waitFor();
    const rows = panel.getByRole('table', { name: 'Changes: saved now against yours' }).locator('tbody tr');
    expect(await rows.evaluateAll((trs) => trs.map((tr) => [...tr.children].slice(0, 3).map((c) => (c as HTMLElement).innerText.trim().replace(/\s+/g, ' '))))).toEqual([
      ['Moisture found both changed', 'Traces', 'Corrosion'],
      ['Notes', 'Driver reports the window also squeaks', expect.any(String)],
      ['Labour', '–', '2 h 0 min'],
    ]);
    // Nothing of mine was written yet.
    expect(db.prepare('select moisture, labour_minutes l, notes from defects where id = ?').get(target.id)).toEqual({ moisture: 'traces', l: null, notes: 'Driver reports the window also squeaks' });
    // Keep their moisture, my labour, their notes.
    await panel.locator('tr[data-field="moisture"]').getByRole('radio', { name: 'Theirs' }).check();
    await panel.getByRole('button', { name: 'Re-apply my choices' }).click();
    await mine.getByRole('status').getByText(/^Saved at/).waitFor();
    expect(db.prepare('select moisture, labour_minutes l, notes from defects where id = ?').get(target.id)).toEqual({ moisture: 'traces', l: 120, notes: 'Driver reports the window also squeaks' });
    expect(await mine.getByRole('radio', { name: 'Traces' }).isChecked()).toBe(true);
  });
});

describe('the GHQ supervisor finds the defect', () => {
  beforeAll(async () => loginAs(h.context, 'supervisor'));

  it('in the Defects list by searching for its ref', async () => {
    const page = h.page;
    await open(page, '/defects');
    await page.getByLabel(/^Search/).first().fill(ref);
    const link = page.getByRole('link', { name: ref, exact: true });
    await link.waitFor();
    await link.click();
    await page.waitForURL((u) => u.pathname === defectPath);
    await expect.poll(async () => (await status(page).textContent())?.trim()).toBe('Closed');
    // Re-opening is a supervisor's step.
    await page.getByRole('group', { name: 'Next steps' }).getByRole('button', { name: 'Re-open' }).waitFor();
  });

  it('on the Overview, counted among the defects GHQ reported in the last 12 months', async () => {
    const page = h.page;
    await open(page, '/');
    // The "Reported" count of the GHQ row in "Repeats by depot" links to the list from the window's first day.
    const figure = page.getByRole('link', { name: /^GHQ: \d+ reported$/ });
    await figure.waitFor();
    const from = new URL((await figure.getAttribute('href'))!, baseUrl()).searchParams.get('reportedFrom');
    expect(from).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    const expected = reportedAtGhqSince(from!);
    expect(await figure.getAttribute('aria-label')).toBe(`GHQ: ${expected} reported`);
    // The defect this file reported is one of them.
    expect(db.prepare('select count(*) n from defects where ref = ? and reported_at >= ?').get(ref, Date.parse(`${from}T00:00:00Z`))).toEqual({ n: 1 });
  });
});

describe('on a 768 px workshop tablet', () => {
  it('shows the defect page and the report form without sideways scrolling, with tap-size controls', async () => {
    await loginAs(h.context, 'technician');
    const page = h.page;
    await page.setViewportSize({ width: 768, height: 1024 });
    for (const path of [defectPath, '/defects/new']) {
      await open(page, path);
      await page.getByRole('heading', { level: 1 }).waitFor();
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow, path).toBeLessThanOrEqual(0);
    }
    // Door tiles and the report button are at least 40 px tall.
    const door = await page.getByRole('radio', { name: /^Front left \(FL\)/ }).boundingBox();
    expect(door!.height).toBeGreaterThanOrEqual(40);
    const submit = await page.getByRole('button', { name: 'Report defect' }).boundingBox();
    expect(submit!.height).toBeGreaterThanOrEqual(40);
    await page.setViewportSize({ width: 1280, height: 900 });
  });
});
