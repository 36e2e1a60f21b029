// Signing in through the real form for every demo role, a wrong password, and signing out.
import { beforeEach, describe, expect, it } from 'vitest';
import { baseUrl, demoUser, loginAs, open, pathOf, signIn, useBrowser, type Role } from './fixtures';

const h = useBrowser();

// What each role sees in the side navigation and under its name (CONTRACT.md "Who may do what":
// Patterns for admins, fleet managers and supervisors, Import for admins and fleet managers, People and Settings
// for admins only).
const BASE_NAV = ['Overview', 'Defects', 'Vehicles', 'Traces', 'Depots', 'Modules'];
const WITH_PATTERNS = ['Overview', 'Defects', 'Vehicles', 'Patterns', 'Traces', 'Depots', 'Modules'];
const EXPECTED: Record<Role, { label: string; nav: string[] }> = {
  admin: { label: 'Admin', nav: [...WITH_PATTERNS, 'Import', 'People', 'Settings'] },
  manager: { label: 'Fleet manager', nav: [...WITH_PATTERNS, 'Import'] },
  supervisor: { label: 'Depot supervisor', nav: WITH_PATTERNS },
  technician: { label: 'Technician', nav: BASE_NAV },
  viewer: { label: 'Viewer', nav: BASE_NAV },
};

describe('sign-in form', () => {
  for (const role of Object.keys(EXPECTED) as Role[]) {
    it(`${role} signs in and lands on the Overview with the navigation of the role`, async () => {
      const page = h.page;
      await h.context.clearCookies();
      await signIn(page, role);
      await page.waitForURL(`${baseUrl()}/`);
      await page.getByRole('heading', { level: 1, name: 'Overview' }).waitFor();

      const { name } = demoUser(role);
      await page.getByText(name, { exact: true }).filter({ visible: true }).first().waitFor();
      await page.getByText(EXPECTED[role].label, { exact: true }).filter({ visible: true }).first().waitFor();

      const nav = page.getByRole('navigation', { name: 'Main' });
      const links = (await nav.getByRole('link').allTextContents()).map((t) => t.trim());
      expect(links).toEqual(EXPECTED[role].nav);
      expect(await nav.getByRole('link', { name: 'Overview' }).getAttribute('aria-current')).toBe('page');
    });
  }

  it('a wrong password shows the error and stays on /signin', async () => {
    const page = h.page;
    await h.context.clearCookies();
    await signIn(page, 'viewer', 'not-the-password');
    await page.waitForURL((u) => u.pathname === '/signin' && u.searchParams.has('error'));
    const alert = page.getByRole('alert');
    await alert.waitFor();
    expect(await alert.textContent()).toContain('That e-mail and password do not match an active account');
    // Still the form, not signed in.
    await page.getByRole('button', { name: 'Sign in' }).waitFor();
    const me = await page.request.get(`${baseUrl()}/api/me`);
    expect(me.status()).toBe(401);
  });

  it('signing out returns to /signin, and pages then send you to /signin', async () => {
    const page = h.page;
    await h.context.clearCookies();
    await signIn(page, 'technician');
    await page.waitForURL(`${baseUrl()}/`);

    await open(page, '/signout');
    await page.getByRole('heading', { level: 1, name: 'Sign out' }).waitFor();
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL((u) => u.pathname === '/signin');
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();

    await open(page, '/vehicles');
    expect(new URL(page.url()).pathname).toBe('/signin');
    expect(pathOf(page)).toContain('vehicles');
    expect((await page.request.get(`${baseUrl()}/api/me`)).status()).toBe(401);
  });
});

describe('pages that are not there, or not for the role', () => {
  // Leave the previous page first: an island of it still loading would be sent to /signin (401) when the cookies
  // change under it, aborting the next navigation.
  beforeEach(async () => {
    await h.page.goto('about:blank');
  });
  it('an unknown address answers 404 "Not Found" with Seepline\'s page in the signed-in shell and a way back', async () => {
    const page = h.page;
    await loginAs(h.context, 'technician');
    h.guard.expectFailure(/\/no-such-page$/, 404);
    const res = await page.goto(`${baseUrl()}/no-such-page`);
    expect([res!.status(), res!.statusText()]).toEqual([404, 'Not Found']);
    await page.getByRole('heading', { level: 1, name: 'There is no page here' }).waitFor();
    expect(await page.getByText('/no-such-page').count()).toBeGreaterThan(0);
    // The navigation stays, and the way back leads to the Overview.
    expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link').count()).toBe(EXPECTED.technician.nav.length);
    await page.getByRole('link', { name: 'Go to the Overview' }).click();
    await page.waitForURL(`${baseUrl()}/`);
  });

  it('a technician following a pattern link gets "not for your role" (403 "Forbidden") at that address, not the Overview', async () => {
    const page = h.page;
    await loginAs(h.context, 'technician');
    h.guard.expectFailure(/\/patterns\/2$/, 403);
    const res = await page.goto(`${baseUrl()}/patterns/2`);
    expect([res!.status(), res!.statusText()]).toEqual([403, 'Forbidden']);
    expect(pathOf(page)).toBe('/patterns/2');
    await page.getByRole('heading', { level: 1, name: 'Patterns is not open to your role' }).waitFor();
    expect(await page.getByText('depot supervisors, fleet managers and admins', { exact: false }).count()).toBe(1);
    await page.getByRole('link', { name: 'Go to the Overview' }).waitFor();
  });

  it('a fleet manager opening Settings gets the same page (403), and an admin the Settings', async () => {
    const page = h.page;
    await loginAs(h.context, 'manager');
    h.guard.expectFailure(/\/settings$/, 403);
    const res = await page.goto(`${baseUrl()}/settings`);
    expect(res!.status()).toBe(403);
    await page.getByRole('heading', { level: 1, name: 'Settings is not open to your role' }).waitFor();
    await loginAs(h.context, 'admin');
    const ok = await page.goto(`${baseUrl()}/settings`);
    expect([ok!.status(), ok!.statusText()]).toEqual([200, 'OK']);
    await page.getByRole('heading', { level: 1, name: 'Settings' }).waitFor();
  });

  it('a record that is not there answers 404 "Not Found" too (not "OK")', async () => {
    const page = h.page;
    await loginAs(h.context, 'supervisor');
    h.guard.expectFailure(/\/vehicles\/SB7LS4DE4ND530116$/, 404);
    const res = await page.goto(`${baseUrl()}/vehicles/SB7LS4DE4ND530116`);
    expect([res!.status(), res!.statusText()]).toEqual([404, 'Not Found']);
    await page.getByRole('heading', { level: 1, name: 'Vehicle not found' }).waitFor();
  });
});
