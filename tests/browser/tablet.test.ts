// Tablet portrait (768 × 1024): no sideways page scrolling, every navigation item in view without scrolling (the bar
// wraps), tap targets of at least 40 px (Sign out, whole table rows, chart points), and the admin tables fitting.
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { bodyRows, loginAs, open, pathOf, useBrowser } from './fixtures';

const h = useBrowser({ width: 768, height: 1024 });
beforeAll(async () => loginAs(h.context, 'technician'));

/** Page width beyond the viewport, in CSS pixels (0 when nothing sticks out). */
async function overflowPx(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
}

/** Every navigation link can be brought into view and lies within the viewport's width. */
async function expectNavReachable(page: Page, expected: string[]): Promise<void> {
  const nav = page.getByRole('navigation', { name: 'Main' });
  await nav.waitFor();
  const links = nav.getByRole('link');
  expect((await links.allTextContents()).map((t) => t.trim())).toEqual(expected);
  // Nothing scrolls sideways: every item is in view as the page opens (the bar wraps onto a second row).
  expect(await nav.evaluate((el) => el.scrollWidth - el.clientWidth)).toBeLessThanOrEqual(0);
  for (const name of expected) {
    const link = nav.getByRole('link', { name, exact: true });
    const box = await link.boundingBox();
    expect(box, `${name} has a box`).not.toBeNull();
    expect(box!.x, `${name} starts inside the viewport`).toBeGreaterThanOrEqual(0);
    expect(box!.x + box!.width, `${name} ends inside the viewport`).toBeLessThanOrEqual(768 + 1);
    expect(box!.height, `${name} is a usable tap target`).toBeGreaterThanOrEqual(40);
  }
  // Sign-out stays at hand on a tablet too, at a usable size.
  const signOut = page.getByRole('link', { name: 'Sign out' }).filter({ visible: true }).first();
  await signOut.waitFor();
  const so = (await signOut.boundingBox())!;
  expect(so.height, 'Sign out is a usable tap target').toBeGreaterThanOrEqual(40);
  expect(so.y + so.height).toBeLessThanOrEqual(120);
}

const NAV = ['Overview', 'Defects', 'Vehicles', 'Traces', 'Depots', 'Modules'];

describe('tablet portrait', () => {
  it('Overview fits the width and the navigation is reachable', async () => {
    const page = h.page;
    await open(page, '/');
    await page.getByRole('heading', { level: 1, name: 'Overview' }).waitFor();
    await page.getByRole('heading', { name: 'Oldest open defects' }).waitFor();
    expect(await overflowPx(page)).toBeLessThanOrEqual(1);
    await expectNavReachable(page, NAV);
    // Following a navigation link works at this size.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Vehicles', exact: true }).click();
    await page.waitForURL((u) => u.pathname === '/vehicles');
  });

  it('Vehicles fits the width once the list has loaded', async () => {
    const page = h.page;
    await open(page, '/vehicles');
    await page.getByRole('heading', { level: 1, name: 'Vehicles' }).waitFor();
    const table = page.getByRole('table', { name: 'Vehicles', exact: true });
    await expect.poll(async () => (await table.getAttribute('aria-busy')) === 'false' && (await bodyRows(table).count()) === 50).toBe(true);
    expect(await overflowPx(page)).toBeLessThanOrEqual(1);
    await expectNavReachable(page, NAV);
    // The Next button of the pager is within the width as well.
    const next = page.getByRole('button', { name: 'Next', exact: true });
    await next.scrollIntoViewIfNeeded();
    const box = await next.boundingBox();
    expect(box!.x + box!.width).toBeLessThanOrEqual(768 + 1);
  });

  it('opens a defect when its row is tapped anywhere, not only on the ref, but not when text is selected', async () => {
    const page = h.page;
    await open(page, '/defects?mine=0');
    const table = page.getByRole('table', { name: 'Defects', exact: true });
    await expect.poll(async () => (await table.getAttribute('aria-busy')) === 'false' && (await bodyRows(table).count()) > 0).toBe(true);
    const row = bodyRows(table).first();
    const href = await row.getAttribute('data-row-href');
    expect(href).toMatch(/^\/defects\/\d+$/);
    // Selecting the symptom text by dragging across it does not open the defect.
    const cell = row.locator('td').nth(3);
    const c = (await cell.boundingBox())!;
    await page.mouse.move(c.x + 4, c.y + 12);
    await page.mouse.down();
    await page.mouse.move(c.x + c.width - 8, c.y + 12, { steps: 8 });
    await page.mouse.up();
    await page.waitForTimeout(300);
    expect(pathOf(page)).toBe('/defects?mine=0');
    await page.evaluate(() => window.getSelection()?.removeAllRanges());
    // A tap on the door cell (no link there) opens it.
    await row.locator('td').nth(2).click({ position: { x: 8, y: 8 } });
    await page.waitForURL((u) => u.pathname === href);
  });

  it('the trend points of the Overview take a 40 px tap', async () => {
    const page = h.page;
    await open(page, '/');
    const points = page.getByRole('figure', { name: /^Repeat rate by month, / }).getByRole('link');
    await points.first().waitFor();
    const box = (await points.first().boundingBox())!;
    expect(Math.min(box.width, box.height)).toBeGreaterThanOrEqual(40);
  });

  it('the admin sees every item at once, the active one included, and the Depots, Modules and People tables fit with their actions', async () => {
    const page = h.page;
    await loginAs(h.context, 'admin');
    try {
      await open(page, '/settings');
      await page.getByRole('heading', { level: 1, name: 'Settings' }).waitFor();
      await expectNavReachable(page, ['Overview', 'Defects', 'Vehicles', 'Patterns', 'Traces', 'Depots', 'Modules', 'Import', 'People', 'Settings']);
      const active = page.getByRole('navigation', { name: 'Main' }).locator('[aria-current="page"]');
      expect((await active.textContent())?.trim()).toBe('Settings');
      expect(await active.isVisible()).toBe(true);

      for (const [path, caption, del] of [
        ['/depots', 'Depots', 'Delete depot GHQ'],
        ['/modules', 'Module catalogue', 'Delete module type WLR-2'],
        ['/people', 'People', 'Reset password of Marta Sealby'],
      ] as const) {
        await open(page, path);
        const table = page.getByRole('table', { name: caption, exact: true });
        await expect.poll(async () => bodyRows(table).count()).toBeGreaterThan(1);
        // No part of the table hides behind a sideways scroll.
        const wrap = table.locator('xpath=..');
        expect(await wrap.evaluate((el) => el.scrollWidth - el.clientWidth), path).toBeLessThanOrEqual(1);
        expect(await overflowPx(page), path).toBeLessThanOrEqual(1);
        const button = page.getByRole('button', { name: del });
        const b = (await button.boundingBox())!;
        expect(b.x + b.width, `${del} is on screen`).toBeLessThanOrEqual(768);
        expect(b.height).toBeGreaterThanOrEqual(40);
        if (path === '/people') continue;
        // GHQ and WLR-2 hold vehicles and defects: the dialog says so and does not offer a delete that would be refused.
        await button.click();
        const dialog = page.getByRole('dialog');
        await dialog.getByText(/cannot be deleted: /).waitFor();
        expect(await dialog.getByRole('button', { name: /^Delete / }).isDisabled()).toBe(true);
        await dialog.getByRole('button', { name: 'Close', exact: true }).first().click();
      }
    } finally {
      await loginAs(h.context, 'technician');
    }
  });
});

