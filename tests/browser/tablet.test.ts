// Tablet portrait (768 × 1024) as a technician: no sideways page scrolling, and the navigation is reachable.
import { beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { bodyRows, loginAs, open, useBrowser } from './fixtures';

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
  for (const name of expected) {
    const link = nav.getByRole('link', { name, exact: true });
    await link.scrollIntoViewIfNeeded();
    const box = await link.boundingBox();
    expect(box, `${name} has a box`).not.toBeNull();
    expect(box!.x, `${name} starts inside the viewport`).toBeGreaterThanOrEqual(0);
    expect(box!.x + box!.width, `${name} ends inside the viewport`).toBeLessThanOrEqual(768 + 1);
    expect(box!.height, `${name} is a usable tap target`).toBeGreaterThanOrEqual(40);
  }
  // Sign-out stays at hand on a tablet too.
  await page.getByRole('link', { name: 'Sign out' }).filter({ visible: true }).first().waitFor();
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
});
