// A defect from report to verified repair, as the GHQ technician does it: report it on a vehicle found by its
// fleet number (an empty submit first, a date before the vehicle was built, a thousands separator, a code
// typed twice), start the diagnosis, record findings, parts and a photo, type the action and mark it
// repaired without saving first (the step saves it; leaving the page before asks), try to close it without
// the release verification (refused, with the reason on screen), record the verification (not before the
// repair), close it; the door map and door history follow each step. The GHQ supervisor then finds it in the
// Defects list, sees it counted on the Overview and re-opens it with a reason the technician sees first.
// The report form warns before the Report button when the door already has an open defect. Then the same
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
    // Nothing filled in: the first field to fix, in form order, is the vehicle; it is outlined as refused.
    await page.getByRole('button', { name: 'Report defect' }).click();
    await page.getByText('Choose the vehicle', { exact: true }).waitFor();
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('role'))).toBe('combobox');
    expect(await page.getByRole('combobox', { name: 'Vehicle' }).getAttribute('aria-invalid')).toBe('true');
    const search = page.getByRole('combobox', { name: 'Vehicle' });
    await search.fill(vehicle.fleet);
    await page.getByRole('option', { name: new RegExp(vehicle.vin) }).click();
    await page.getByTestId('chosen-vehicle').getByText(vehicle.vin).waitFor();

    await page.getByRole('radio', { name: /^Rear left \(RL\)/ }).click();
    expect(await page.getByRole('radio', { name: /^Rear left \(RL\)/ }).getAttribute('aria-checked')).toBe('true');
    await page.getByLabel('Module type').selectOption('WLR-2');
    await page.getByRole('button', { name: '+ Window reverses when closing' }).click();
    expect(await page.getByRole('textbox', { name: 'Symptom' }).inputValue()).toBe('Window reverses when closing');
    // The symptom's limit is in view while typing.
    await page.getByText('28 / 500', { exact: true }).waitFor();

    // Live decoding: a valid code and its failure type, then a mistyped one (said once), then one typed twice.
    const codes = page.getByRole('textbox', { name: 'Fault codes', exact: true });
    await codes.fill('b1a21-29 B1A22-13');
    const decoded = page.getByRole('list', { name: 'Fault codes decoded' });
    await decoded.getByText("Body, vehicle maker's own code · Failure type 29: signal invalid (General Signal)").waitFor();
    await decoded.getByText("Body, vehicle maker's own code · Failure type 13: circuit open (General Electrical)").waitFor();
    await codes.fill('B1A21-29 X1234 B1A21-29');
    await decoded.getByText(/"X1234" is not a fault code/).waitFor();
    await decoded.getByText('typed twice: it is kept once.').waitFor();
    await page.getByRole('button', { name: 'Report defect' }).click();
    await page.getByText('Fix the code marked below, or remove it').waitFor();
    expect(await page.getByText(/"X1234" is not a fault code/).count()).toBe(1);
    expect(await codes.evaluate((el) => el === document.activeElement)).toBe(true);
    await codes.fill('B1A21-29 B1A22-29');
    // As the app shows it: with a thousands separator.
    await page.getByRole('textbox', { name: 'Odometer, km' }).fill('61,234');

    // A date before the vehicle was built is refused before anything is sent.
    const built = (db.prepare('select build_month m from vehicles where vin = ?').get(vehicle.vin) as { m: string }).m;
    const reportedAt = page.getByLabel('Reported at');
    const now = await reportedAt.inputValue();
    await reportedAt.fill(`${Number(built.slice(0, 4)) - 3}-01-01T10:00`);
    await page.getByRole('button', { name: 'Report defect' }).click();
    await page.getByText(/^Reported at is before the vehicle was built \(\w{3} \d{4}\): check the date$/).waitFor();
    expect(await reportedAt.evaluate((el) => el === document.activeElement)).toBe(true);
    await reportedAt.fill(now);

    await page.getByRole('button', { name: 'Report defect' }).click();
    await page.waitForURL(/\/defects\/\d+$/);
    defectPath = new URL(page.url()).pathname;
    const h1 = page.getByRole('heading', { level: 1 });
    ref = ((await h1.textContent()) ?? '').trim();
    // One ref format for every defect: DF-YY-NNNNN by the year of the report.
    expect(ref).toMatch(new RegExp(`^DF-${String(new Date().getUTCFullYear()).slice(2)}-\\d{5}$`));
    // The ref is the page's heading, large enough to read across the bay.
    expect(Number.parseFloat(await h1.evaluate((el) => getComputedStyle(el).fontSize))).toBeGreaterThanOrEqual(24);

    const row = db.prepare('select d.status, d.position, d.dtcs, d.odometer_km, m.code from defects d join modules m on m.id = d.module_id where d.ref = ?').get(ref);
    expect(row).toEqual({ status: 'reported', position: 'RL', dtcs: 'B1A21-29 B1A22-29', odometer_km: 61234, code: 'WLR-2' });
    expect((await status(page).textContent())?.trim()).toBe('Reported');
    // Each code decoded once: what it is, then its failure type.
    const table = page.getByRole('table', { name: `Fault codes of ${ref}, decoded` });
    expect(await table.locator('thead th').allInnerTexts()).toEqual(['CODE', 'WHAT IT IS', 'FAILURE TYPE']);
    expect(await table.getByRole('row', { name: /B1A22-29/ }).innerText()).toMatch(/B1A22-29\s+Body, vehicle maker's own code\s+29: signal invalid \(General Signal\)/);
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

  it('asks before leaving with the action typed but not saved, and the step saves it', async () => {
    const page = h.page;
    const form = page.getByRole('form', { name: 'Diagnosis and repair record' });
    const action = 'Replaced the window lifter motor, fitted a new membrane, cleared the drain holes';
    await form.getByLabel('Action (what was done)').fill(action);
    await page.getByTestId('unsaved-note').getByText('Unsaved changes to the diagnosis and repair record.').waitFor();
    // A link of the page: asked in the app; staying keeps the text.
    await page.getByRole('navigation', { name: 'Breadcrumb' }).getByRole('link', { name: 'Defects' }).click();
    const leave = page.getByRole('dialog', { name: 'Leave without saving?' });
    await leave.getByText('The diagnosis and repair record has changes that are not saved yet.', { exact: false }).waitFor();
    await leave.getByRole('button', { name: 'Stay on this page' }).click();
    await leave.waitFor({ state: 'hidden' });
    expect(new URL(page.url()).pathname).toBe(defectPath);
    expect(await form.getByLabel('Action (what was done)').inputValue()).toBe(action);
    // Reload: the browser's own question; dismissing it stays.
    const asked = new Promise<string>((resolve) => page.once('dialog', (d) => void d.dismiss().then(() => resolve(d.type()))));
    void page.evaluate(() => window.location.reload()).catch(() => undefined);
    expect(await asked).toBe('beforeunload');
    expect(await form.getByLabel('Action (what was done)').inputValue()).toBe(action);

    // "Mark repaired" with the action typed but not saved: saved first, then the step.
    expect(db.prepare('select action from defects where ref = ?').get(ref)).toEqual({ action: null });
    await step(page, 'Mark repaired', 'Repaired');
    expect(db.prepare('select action from defects where ref = ?').get(ref)).toEqual({ action });
    await page.getByTestId('next-step').getByText(/record that verification/).waitFor();
    expect(await page.getByTestId('unsaved-note').count()).toBe(0);
    expect(await page.getByTestId('step-refusal').count()).toBe(0);
  });

  it('is refused closing without the release verification, verifies (not before the repair) and closes; the door cards follow', async () => {
    const page = h.page;
    // The door history and the door map show the status of now, without a reload.
    const history = page.getByTestId('door-history');
    await history.getByRole('row', { name: new RegExp(ref) }).getByText('Repaired').waitFor();

    // Closing a window lifter without the verification: the server refuses and the reason is shown.
    h.guard.expectFailure(/\/api\/defects\/\d+\/transitions$/, 422);
    await page.getByRole('group', { name: 'Next steps' }).getByRole('button', { name: 'Close', exact: true }).click();
    const closeDialog = page.getByRole('dialog', { name: `Close ${ref}` });
    await closeDialog.getByTestId('safety-cautions').getByText(/100 N limit on closing force/).waitFor();
    await closeDialog.getByRole('button', { name: 'Close defect' }).click();
    await closeDialog.getByRole('alert').getByText(/record the release verification before closing it/).waitFor();
    expect((await status(page).textContent())?.trim()).toBe('Repaired');
    // The buttons keep their labels after the refusal.
    await closeDialog.getByRole('button', { name: 'Cancel', exact: true }).click();

    await page.getByRole('group', { name: 'Next steps' }).getByRole('button', { name: 'Record verification' }).click();
    const verify = page.getByRole('dialog', { name: 'Record the release verification' });
    await verify.getByText('Seepline records them; it certifies nothing.', { exact: false }).waitFor();
    await verify.getByRole('button', { name: 'Record verification' }).click();
    await verify.getByRole('alert').getByText(/Tick both checks/).waitFor();
    await verify.getByLabel("The window has been re-initialised as the vehicle maker's procedure says").check();
    await verify.getByLabel('Automatic closing reverses on an obstruction').check();
    await verify.getByLabel(/How it was checked/).fill('Test rod at the top of travel');
    // Dated an hour before the repair was recorded: refused.
    const checkedAt = verify.getByLabel('Checked at');
    const now = await checkedAt.inputValue();
    const hourBefore = new Date(new Date(now).getTime() - 3_600_000);
    const local = new Date(hourBefore.getTime() - hourBefore.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);
    await checkedAt.fill(local);
    await verify.getByRole('button', { name: 'Record verification' }).click();
    await verify.getByRole('alert').getByText(/The verification cannot be before the repair was recorded/).waitFor();
    expect(await verify.getByRole('button', { name: 'Cancel', exact: true }).count()).toBe(1);
    await checkedAt.fill(now);
    await verify.getByRole('button', { name: 'Record verification' }).click();
    await expect.poll(async () => (await status(page).textContent())?.trim()).toBe('Verified');
    await page.getByTestId('verification').getByText(demoUser('technician').name).waitFor();
    await history.getByRole('row', { name: new RegExp(ref) }).getByText('Verified').waitFor();

    await page.getByRole('group', { name: 'Next steps' }).getByRole('button', { name: 'Close and release' }).click();
    await page.getByRole('dialog', { name: `Close ${ref}` }).getByRole('button', { name: 'Close defect' }).click();
    await expect.poll(async () => (await status(page).textContent())?.trim()).toBe('Closed');
    await history.getByRole('row', { name: new RegExp(ref) }).getByText('Closed').waitFor();
    const rlTile = page.getByTestId('door-map').locator('[data-door="RL"]');
    await expect.poll(() => rlTile.getAttribute('aria-label')).toMatch(/^Rear left: \d+ defects?, 0 open/);
    const row = db.prepare('select status, verified_reinit r, verified_reversal v, verified_by_id b, closed_at c from defects where ref = ?').get(ref) as Record<string, unknown>;
    expect(row).toMatchObject({ status: 'closed', r: 1, v: 1 });
    expect(row.c).not.toBeNull();
    // The timeline names every step; the audit trail has the verification and the status changes.
    await page.getByText('All status changes (4)').click();
    const steps = page.getByRole('list', { name: 'Status changes, oldest first' }).getByRole('listitem');
    expect(await steps.count()).toBe(4);
    const audit = page.getByRole('table', { name: `Changes to ${ref}, newest first` });
    await audit.getByText('Auto-reverse checked').waitFor();
    // People by name, not by id; closing is one row.
    const name = demoUser('technician').name;
    expect(await audit.getByRole('row', { name: /Assigned to/ }).innerText()).toMatch(new RegExp(`– → ${name}`));
    expect(await audit.getByRole('row', { name: /Verified by/ }).innerText()).toMatch(new RegExp(`– → ${name}`));
    expect(await audit.getByRole('row', { name: /Status.*Verified.*Closed/ }).count()).toBe(1);
    expect(await audit.getByRole('row', { name: /Changed · Closed/ }).count()).toBe(0);
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
    // Where the person is looking: the panel is brought into view and focused, and the Save button says why.
    await expect.poll(() => panel.evaluate((el) => el === document.activeElement)).toBe(true);
    const box = (await panel.boundingBox())!;
    const viewport = page.viewportSize()!;
    expect(box.y).toBeGreaterThanOrEqual(0);
    expect(box.y).toBeLessThan(viewport.height);
    expect(await mine.getByTestId('save-conflict-note').innerText()).toMatch(/^Not saved: someone changed this defect while you were editing\./);
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
    // Re-opening is a supervisor's step, with a reason; the dialog's buttons keep their labels after a refusal.
    await page.getByRole('group', { name: 'Next steps' }).getByRole('button', { name: 'Re-open' }).click();
    const dialog = page.getByRole('dialog', { name: `Re-open: ${ref}` });
    await dialog.getByRole('button', { name: 'Re-open' }).click();
    await dialog.getByRole('alert').getByText('Say why.').waitFor();
    expect(await dialog.locator('footer button').allInnerTexts()).toEqual(['Cancel', 'Re-open']);
    const reason = 'Driver says the window still stops half way when it rains';
    await dialog.getByLabel(/^Reason/).fill(reason);
    await dialog.getByRole('button', { name: 'Re-open' }).click();
    await expect.poll(async () => (await status(page).textContent())?.trim()).toBe('Diagnosing');
    // The reason is at the top of the status panel, not only in the collapsed list of changes.
    const why = page.getByTestId('status-reason');
    expect(await why.innerText()).toMatch(new RegExp(`^Re-opened .* by ${demoUser('supervisor').name}: “${reason}”$`));
    expect(await why.isVisible()).toBe(true);
  });

  it('cancelling asks with two buttons that cannot be confused', async () => {
    const page = h.page;
    await page.getByRole('group', { name: 'Next steps' }).getByRole('button', { name: 'Cancel defect' }).click();
    const dialog = page.getByRole('dialog', { name: `Cancel ${ref}?` });
    expect(await dialog.locator('footer button').allInnerTexts()).toEqual(['Keep the defect', 'Cancel the defect']);
    await dialog.getByRole('button', { name: 'Keep the defect' }).click();
    await dialog.waitFor({ state: 'hidden' });
    expect((await status(page).textContent())?.trim()).toBe('Diagnosing');
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

describe('reporting on a door that already has an open defect', () => {
  beforeAll(async () => loginAs(h.context, 'technician'));

  it('says so next to the door and module, before the Report button, and asks to choose', async () => {
    const open_ = db
      .prepare(
        `select x.id, x.ref, x.position, m.code, v.vin from defects x join vehicles v on v.id = x.vehicle_id join modules m on m.id = x.module_id
         join depots d on d.id = x.depot_id where d.code = 'GHQ' and x.status in ('reported', 'diagnosing', 'awaiting_parts') order by x.id limit 1`,
      )
      .get() as { id: number; ref: string; position: string; code: string; vin: string };
    const page = h.page;
    await open(page, `/defects/new?vin=${open_.vin}`);
    await page.getByTestId('chosen-vehicle').waitFor();
    await page.getByRole('radio', { name: new RegExp(`\\(${open_.position}\\)`) }).click();
    await page.getByLabel('Module type').selectOption(open_.code);
    const choice = page.getByTestId('open-defect-choice');
    await choice.getByText(`This door already has an open defect of this kind: ${open_.ref}`, { exact: false }).waitFor();
    // Above the Report button, inside the door-and-module step.
    const choiceBox = (await choice.boundingBox())!;
    const reportBox = (await page.getByRole('button', { name: 'Report defect' }).boundingBox())!;
    expect(choiceBox.y + choiceBox.height).toBeLessThan(reportBox.y);
    expect(await page.getByRole('region', { name: '2. Door and module' }).getByTestId('open-defect-choice').count()).toBe(1);
    expect(await choice.getByRole('link', { name: `Open ${open_.ref}` }).getAttribute('href')).toBe(`/defects/${open_.id}`);
    // Submitting without choosing: nothing is sent, the choice is asked for and focused.
    await page.getByRole('textbox', { name: 'Symptom' }).fill('Window stops part way');
    let posted = false;
    const onRequest = (r: { method: () => string; url: () => string }) => {
      if (r.method() === 'POST' && r.url().endsWith('/api/defects')) posted = true;
    };
    page.on('request', onRequest);
    await page.getByRole('button', { name: 'Report defect' }).click();
    await choice.getByRole('alert').getByText(`Choose first: open ${open_.ref}, or tick that this is another fault.`).waitFor();
    expect(await choice.evaluate((el) => el === document.activeElement)).toBe(true);
    page.off('request', onRequest);
    expect(posted).toBe(false);
    // "Open" is a choice the person made: no leave question, straight to that defect.
    await choice.getByRole('link', { name: `Open ${open_.ref}` }).click();
    await page.waitForURL((u) => u.pathname === `/defects/${open_.id}`);
  });
});

describe('"Report a defect" keeps what was typed', () => {
  beforeAll(async () => loginAs(h.context, 'technician'));

  it('asks before a link leaves a half-typed report, and asks the browser on reload', async () => {
    const page = h.page;
    await open(page, '/defects/new');
    const symptom = page.getByRole('textbox', { name: 'Symptom' });
    await symptom.fill('Window stops half way, only when it rains');
    await page.getByRole('navigation', { name: 'Breadcrumb' }).getByRole('link', { name: 'Defects' }).click();
    const leave = page.getByRole('dialog', { name: 'Leave without saving?' });
    await leave.getByText('The report has changes that are not saved yet.', { exact: false }).waitFor();
    await leave.getByRole('button', { name: 'Stay on this page' }).click();
    expect(new URL(page.url()).pathname).toBe('/defects/new');
    expect(await symptom.inputValue()).toBe('Window stops half way, only when it rains');
    const asked = new Promise<string>((resolve) => page.once('dialog', (d) => void d.dismiss().then(() => resolve(d.type()))));
    void page.evaluate(() => window.location.reload()).catch(() => undefined);
    expect(await asked).toBe('beforeunload');
    // Leaving on purpose works.
    await page.getByRole('navigation', { name: 'Breadcrumb' }).getByRole('link', { name: 'Defects' }).click();
    await leave.getByRole('button', { name: 'Leave without saving' }).click();
    await page.waitForURL((u) => u.pathname === '/defects');
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
    // A long unbroken word in the symptom (a pasted code or link) wraps instead of widening the page.
    const long = `Seen-on-scan:${'A'.repeat(120)}`;
    const res = await page.request.patch(`${baseUrl()}/api${defectPath}`, { headers: { Origin: baseUrl() }, data: { symptom: long } });
    expect(res.status(), await res.text()).toBe(200);
    await open(page, defectPath);
    await page.getByTestId('symptom').getByText(long).waitFor();
    expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(0);
    await open(page, '/defects/new');
    await page.getByRole('heading', { level: 1 }).waitFor();
    // Door tiles and the report button are at least 40 px tall.
    const door = await page.getByRole('radio', { name: /^Front left \(FL\)/ }).boundingBox();
    expect(door!.height).toBeGreaterThanOrEqual(40);
    const submit = await page.getByRole('button', { name: 'Report defect' }).boundingBox();
    expect(submit!.height).toBeGreaterThanOrEqual(40);
    await page.setViewportSize({ width: 1280, height: 900 });
  });
});
