// Traces as a technician: upload a capture on a defect (staying on the defect page, typed work kept) and
// open its verdict and plot; zoom the plot
// (buttons, drag, wheel, pinch); upload from the Traces page with upload progress; a file the analysis
// cannot use names its line; the trace page on a 768 px tablet.
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page, Request } from 'playwright-core';
import { baseUrl, loginAs, open, useBrowser } from './fixtures';
import { captureToCsv, generateCapture } from '../../src/lib/traces/generate';

const h = useBrowser();
beforeAll(async () => loginAs(h.context, 'technician'));

/** A GHQ defect (the technician's depot) that has no trace yet. */
async function defectWithoutTraces(): Promise<{ id: number; ref: string }> {
  const res = await h.context.request.get(`${baseUrl()}/api/defects?module=WLR-2&pageSize=100&sort=-reportedAt`);
  expect(res.status()).toBe(200);
  const { items } = (await res.json()) as { items: Array<{ id: number; ref: string }> };
  for (const d of items) {
    const t = await h.context.request.get(`${baseUrl()}/api/traces?defectId=${d.id}`);
    if (((await t.json()) as { total: number }).total === 0) return d;
  }
  throw new Error('no GHQ window-lifter defect without a trace in the demo data');
}

/** The text under the plot saying which window is shown. */
const plotWindow = (page: Page) => page.getByTestId('plot-window').innerText();

/** Wait until the plot shows a window whose text matches. */
async function waitForWindow(page: Page, re: RegExp): Promise<string> {
  await expect.poll(() => plotWindow(page), { timeout: 10_000 }).toMatch(re);
  return plotWindow(page);
}

const healthy = captureToCsv(
  generateCapture({ freqHz: 180, sampleRateHz: 100_000, samples: 20_000, phaseDeg: 90, lowV: 0.15, highV: 4.9, noiseV: 0.03, seed: 77 }),
  { timeUnit: 'ms' },
);

describe('Traces', () => {
  let tracePath = '';

  it('a technician uploads a capture on a defect, stays on the defect page, and opens the verdict and the plot', async () => {
    const page = h.page;
    const defect = await defectWithoutTraces();
    await open(page, `/defects/${defect.id}`);
    // Work typed in the diagnosis form and not saved yet is kept through the upload.
    const notes = page.getByRole('form', { name: 'Diagnosis and repair record' }).getByLabel('Notes');
    const typed = 'Scope on the FL harness connector, motor running up';
    const editable = (await notes.count()) > 0;
    const before = editable ? await notes.inputValue() : '';
    if (editable) await notes.fill(typed);
    const card = page.getByRole('region', { name: 'Scope traces' });
    await card.getByText('No scope captures on this defect yet.', { exact: false }).waitFor();
    await card.getByLabel('Pulses per revolution').fill('2');
    await card.getByLabel('Capture file', { exact: true }).setInputFiles({ name: 'door-fl-hall.csv', mimeType: 'text/csv', buffer: Buffer.from(healthy) });
    await card.getByTestId('trace-added').getByText('Healthy', { exact: true }).waitFor();
    await card.getByTestId('trace-added').getByText('door-fl-hall.csv', { exact: true }).waitFor();
    expect(new URL(page.url()).pathname).toBe(`/defects/${defect.id}`);
    if (editable) expect(await notes.inputValue()).toBe(typed);
    // The new trace is in the card with its verdict; the audit trail says what happened in words.
    const listed = page.getByRole('list', { name: 'Traces on this defect' });
    await listed.getByRole('link', { name: 'door-fl-hall.csv' }).waitFor();
    expect(await listed.innerText()).toMatch(/Healthy/);
    await page.getByRole('table', { name: /^Changes to .*, newest first$/ }).getByText('Scope trace added').first().waitFor();
    // Back to the saved text, so that opening the trace does not ask about unsaved changes.
    if (editable) await notes.fill(before);
    await card.getByTestId('trace-added').getByRole('link', { name: 'Open the trace' }).click();
    await page.waitForURL(/\/traces\/\d+$/);
    tracePath = new URL(page.url()).pathname;

    const verdict = page.getByTestId('trace-verdict');
    await expect.poll(() => verdict.innerText()).toMatch(/verdict\s+healthy/i);
    await page.getByRole('heading', { level: 1, name: 'door-fl-hall.csv' }).waitFor();
    await page.getByRole('link', { name: defect.ref }).first().waitFor();
    await page.getByRole('heading', { name: 'The encoder signals look healthy' }).waitFor();
    // The plot: two lanes drawn, the whole capture in view.
    await page.locator('[data-lane="a"] canvas').waitFor();
    await page.locator('[data-lane="b"] canvas').waitFor();
    await waitForWindow(page, /^The whole capture: 200 ms/);
    // The figures: 180 Hz, 90 degrees, A leads, 5,400 rpm at 2 pulses per revolution.
    const figures = page.getByTestId('channel-figures');
    expect(await figures.getByRole('row', { name: /Frequency/ }).innerText()).toMatch(/Frequency\s+180\.0 Hz\s+180\.0 Hz/);
    const between = await page.getByTestId('between-figures').innerText();
    expect(between).toMatch(/Phase \(B behind A\)\s+(89\.\d|90\.\d)°/);
    expect(between).toMatch(/Direction\s+A leads B/);
    expect(between).toMatch(/5,4\d\d rpm/);
    // Safety cautions beside the verdict.
    await page.getByRole('heading', { name: 'Before and after work on this door' }).waitFor();

    // The defect page now lists it with its verdict.
    await open(page, `/defects/${defect.id}`);
    const list = page.getByRole('list', { name: 'Traces on this defect' });
    await list.getByRole('link', { name: 'door-fl-hall.csv' }).waitFor();
    expect(await list.innerText()).toMatch(/Healthy/);
  });

  it('zooms by buttons, by dragging across the plot and with the wheel, down to every sample, and resets', async () => {
    const page = h.page;
    expect(tracePath).not.toBe('');
    await open(page, tracePath);
    await waitForWindow(page, /^The whole capture/);

    const windows: string[] = [];
    const onRequest = (r: Request) => {
      if (r.url().includes('/samples?')) windows.push(new URL(r.url()).search);
    };
    page.on('request', onRequest);
    await page.getByRole('button', { name: 'Zoom in' }).click();
    const half = await waitForWindow(page, /^100 ms shown, from 50 ms to 150 ms of 200 ms/);
    expect(half).toBeTruthy();
    // The middle half was fetched as a new window (seconds in the query).
    const near = (w: string, from: number, to: number) => {
      const q = new URLSearchParams(w);
      return Math.abs(Number(q.get('from')) - from) < 1e-3 && Math.abs(Number(q.get('to')) - to) < 1e-3;
    };
    await expect.poll(() => windows.some((w) => near(w, 0.05, 0.15))).toBe(true);

    // Drag from 40% to 60% of lane A's width: a fifth of 100 ms.
    const over = page.locator('[data-lane="a"] .u-over');
    const box = (await over.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.4, box.y + box.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.6, box.y + box.height / 2, { steps: 6 });
    await page.mouse.up();
    await waitForWindow(page, /^(19\.\d|20\.\d) ms shown, from (89|90)\.\d ms to (109|110|111)\.\d ms/);

    // Wheel up over the plot zooms in further, around the pointer, until every sample is drawn.
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height / 2);
    for (let i = 0; i < 12; i++) await page.mouse.wheel(0, -100);
    await expect.poll(() => page.getByText(/Every sample shown/).count(), { timeout: 10_000 }).toBe(1);
    const fine = await plotWindow(page);
    expect(fine).toMatch(/(µs|ms) shown/);

    await page.getByRole('button', { name: 'Reset' }).click();
    await waitForWindow(page, /^The whole capture: 200 ms/);
    expect(await page.getByRole('button', { name: 'Reset' }).isDisabled()).toBe(true);
    page.off('request', onRequest);
  });

  it('uploads from the Traces page with upload progress, then opens the result', async () => {
    const page = h.page;
    await open(page, '/traces');
    await page.getByRole('heading', { level: 1, name: 'Traces' }).waitFor();
    // A 6 MB capture on a throttled connection, so the progress can be seen.
    const big = captureToCsv(
      generateCapture({ freqHz: 150, sampleRateHz: 200_000, samples: 250_000, phaseDeg: -95, lowV: 0.3, highV: 11.8, noiseV: 0.05, seed: 78 }),
    );
    const cdp = await h.context.newCDPSession(page);
    await cdp.send('Network.enable');
    await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 20, downloadThroughput: -1, uploadThroughput: 3 * 1024 * 1024 });
    try {
      await page.getByLabel('Capture file', { exact: true }).setInputFiles({ name: 'bench-12v.csv', mimeType: 'text/csv', buffer: Buffer.from(big) });
      const bar = page.getByRole('progressbar', { name: 'Uploading bench-12v.csv' });
      await bar.waitFor();
      await expect.poll(async () => Number((await bar.getAttribute('aria-valuenow')) ?? '0'), { timeout: 10_000 }).toBeGreaterThan(0);
      await page.waitForURL(/\/traces\/\d+$/, { timeout: 30_000 });
    } finally {
      await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
      await cdp.detach();
    }
    await expect.poll(() => page.getByTestId('trace-verdict').innerText()).toMatch(/Healthy/);
    expect(await page.getByTestId('between-figures').innerText()).toMatch(/Direction\s+B leads A/);
    expect(await page.getByText('Not attached to a defect.').count()).toBe(1);
    // It is listed on the Traces page.
    await open(page, '/traces');
    await page.getByRole('link', { name: 'bench-12v.csv' }).waitFor();
  });

  it('lists stored traces newest first, sorts by a column, and shows depot times with their zone', async () => {
    const page = h.page;
    const api = (await (await h.context.request.get(`${baseUrl()}/api/traces?pageSize=200`)).json()) as { items: Array<{ fileName: string | null; createdAt: string; depotCode: string | null }> };
    const times = api.items.map((t) => Date.parse(t.createdAt));
    expect(times.length).toBeGreaterThan(2);
    expect(times).toEqual([...times].sort((a, b) => b - a));
    await open(page, '/traces');
    const table = page.getByRole('table', { name: 'Stored traces' });
    await expect.poll(async () => table.locator('tbody tr').count()).toBe(Math.min(25, api.items.length));
    // Each row's capture (its link to the trace page) and its text, whichever layout the width picks.
    const rows = () =>
      table.locator('tbody tr').evaluateAll((trs) => trs.map((tr) => ({ name: tr.querySelector('a[href^="/traces/"]')?.textContent?.trim() ?? '', text: (tr as HTMLElement).innerText })));
    const names = async () => (await rows()).map((r) => r.name);
    expect(await names()).toEqual(api.items.slice(0, 25).map((t) => t.fileName));
    // The stored time of a depot's trace is in the depot's zone, labelled.
    const shown = await rows();
    api.items.slice(0, 25).forEach((t, i) => {
      if (t.depotCode) expect(shown[i]!.text).toMatch(/\d{2}:\d{2} (GMT|BST|UTC)\b/);
    });
    // Oldest first by the header of the stored time.
    await table.locator('thead').getByRole('button', { name: /stored/i }).click();
    await expect.poll(() => new URL(page.url()).searchParams.get('sort')).toBe('createdAt');
    const oldest = [...api.items].sort((a, b) => Date.parse(a.createdAt) - Date.parse(b.createdAt)).slice(0, 25).map((t) => t.fileName);
    await expect.poll(names).toEqual(oldest);
  });

  it('names the line of a capture it cannot use', async () => {
    const page = h.page;
    h.guard.expectFailure(/\/api\/traces$/, 422);
    await open(page, '/traces');
    await page.getByLabel('Capture file', { exact: true }).setInputFiles({
      name: 'one-channel.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from('Scope export\ntime (ms),A (V)\n0,0.1\n0.01,4.9\n'),
    });
    const alert = page.getByRole('alert');
    await alert.waitFor();
    expect(await alert.innerText()).toMatch(/one-channel\.csv could not be measured\.[\s\S]*line 3: only one channel/);
    expect(new URL(page.url()).pathname).toBe('/traces');
  });

  it('looks right on a 768 px tablet: no sideways scrolling, usable zoom buttons, pinch to zoom, verdict first', async () => {
    const page = h.page;
    await page.setViewportSize({ width: 768, height: 1024 });
    try {
      await open(page, tracePath);
      await waitForWindow(page, /^The whole capture/);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow).toBeLessThanOrEqual(1);
      for (const name of ['Zoom in', 'Zoom out', 'Earlier', 'Later', 'Reset']) {
        const b = (await page.getByRole('button', { name }).boundingBox())!;
        expect(b.height, name).toBeGreaterThanOrEqual(40);
        expect(b.x + b.width, name).toBeLessThanOrEqual(768);
      }
      const lane = (await page.locator('[data-lane="b"]').boundingBox())!;
      expect(lane.x + lane.width).toBeLessThanOrEqual(768);
      expect(lane.width).toBeGreaterThan(600);
      // Pinch out with two fingers over lane A: zooms in around the fingers.
      const cdp = await h.context.newCDPSession(page);
      try {
        await cdp.send('Emulation.setTouchEmulationEnabled', { enabled: true, maxTouchPoints: 2 });
        await page.locator('[data-lane="a"]').scrollIntoViewIfNeeded();
        const over = (await page.locator('[data-lane="a"] .u-over').boundingBox())!;
        const cx = over.x + over.width / 2;
        const cy = over.y + over.height / 2;
        const fingers = (d: number) => [
          { x: cx - d, y: cy, id: 1 },
          { x: cx + d, y: cy, id: 2 },
        ];
        await cdp.send('Input.dispatchTouchEvent', { type: 'touchStart', touchPoints: fingers(20) });
        for (let d = 30; d <= 80; d += 10) await cdp.send('Input.dispatchTouchEvent', { type: 'touchMove', touchPoints: fingers(d) });
        await cdp.send('Input.dispatchTouchEvent', { type: 'touchEnd', touchPoints: [] });
        await waitForWindow(page, /^50\.0 ms shown, from 75\.0 ms to 125\.0 ms of 200 ms/);
      } finally {
        await cdp.send('Emulation.setTouchEmulationEnabled', { enabled: false });
        await cdp.detach();
      }
      const verdictTop = (await page.getByTestId('trace-verdict').boundingBox())!.y;
      const plotTop = (await page.getByRole('heading', { name: 'Both channels' }).boundingBox())!.y;
      expect(verdictTop).toBeLessThan(plotTop);
      await open(page, '/traces');
      await page.getByRole('table', { name: 'Stored traces' }).waitFor();
      expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(1);
    } finally {
      await page.setViewportSize({ width: 1280, height: 900 });
    }
  });
});
