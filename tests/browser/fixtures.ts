/**
 * Browser-test helpers: one Chromium (Debian's, driven by playwright-core) per test file in a fresh persistent
 * profile, sign-in through the real form or by HTTP, a console guard that fails a test on any unexpected
 * console error or page error, and small readers for the server-driven tables.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, afterEach, beforeAll, beforeEach, expect, inject } from 'vitest';
import { chromium, type BrowserContext, type ConsoleMessage, type Locator, type Page } from 'playwright-core';
import { DEMO_PASSWORD, DEMO_SIGN_INS } from '../../seed/demo-data';

export type Role = 'admin' | 'manager' | 'supervisor' | 'technician' | 'viewer';
export const ROLES: readonly Role[] = ['admin', 'manager', 'supervisor', 'technician', 'viewer'];

/** The demo person of a role, as seeded by the global set-up. */
export function demoUser(role: Role): { name: string; email: string; password: string; depots: string[] } {
  const p = DEMO_SIGN_INS.find((d) => d.role === role);
  if (!p) throw new Error(`no demo sign-in for ${role}`);
  return { name: p.name, email: p.email, password: DEMO_PASSWORD, depots: p.depots };
}

/** The server the global set-up started. */
export function baseUrl(): string {
  return inject('baseUrl');
}

/** The database the global set-up seeded (the server runs on it). */
export const E2E_DB_PATH = inject('e2eDbPath');

export type Viewport = { width: number; height: number };

/** A fresh persistent Chromium profile; `close()` also removes the profile directory. */
export async function launch(viewport: Viewport = { width: 1280, height: 900 }): Promise<{ context: BrowserContext; close: () => Promise<void> }> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'seepline-e2e-'));
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
    viewport,
  });
  context.setDefaultTimeout(15_000);
  return {
    context,
    close: async () => {
      await context.close();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Sign in through the /signin form as it is (labels, button); does not wait for the landing page. */
export async function signIn(page: Page, role: Role, password = demoUser(role).password): Promise<void> {
  await page.goto(`${baseUrl()}/signin`);
  await page.getByLabel('E-mail').fill(demoUser(role).email);
  await page.getByLabel('Password').fill(password);
  // The button is enabled once the page has fetched its CSRF token; click() waits for that.
  await page.getByRole('button', { name: 'Sign in' }).click();
}

function setCookiePairs(res: Response): string[] {
  return res.headers.getSetCookie().map((c) => c.split(';')[0] ?? '').filter((c) => c.includes('='));
}

const sessionCache = new Map<Role, { name: string; value: string }>();

/**
 * Sign in by HTTP (Auth.js: GET /api/auth/csrf keeping its cookie, then POST the credentials form with an
 * Origin header) and give the session cookie to the browser context. For tests that are not about sign-in.
 */
export async function loginAs(context: BrowserContext, role: Role): Promise<void> {
  const base = baseUrl();
  let session = sessionCache.get(role);
  if (!session) {
    const csrfRes = await fetch(`${base}/api/auth/csrf`);
    expect(csrfRes.status, 'GET /api/auth/csrf').toBe(200);
    const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
    const jar = setCookiePairs(csrfRes);
    const u = demoUser(role);
    const res = await fetch(`${base}/api/auth/callback/credentials`, {
      method: 'POST',
      redirect: 'manual',
      headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: base, Cookie: jar.join('; ') },
      body: new URLSearchParams({ csrfToken, email: u.email, password: u.password, callbackUrl: `${base}/` }).toString(),
    });
    expect(res.status, 'credentials callback').toBe(302);
    const pair = setCookiePairs(res).find((c) => /^(__Secure-)?authjs\.session-token=/.test(c));
    if (!pair) throw new Error(`no session cookie after signing in as ${role} (redirected to ${res.headers.get('location')})`);
    const eq = pair.indexOf('=');
    session = { name: pair.slice(0, eq), value: pair.slice(eq + 1) };
    sessionCache.set(role, session);
  }
  await context.clearCookies();
  await context.addCookies([{ name: session.name, value: session.value, url: base, httpOnly: true, sameSite: 'Lax' }]);
}

type ExpectedFailure = { url: RegExp; status: number };

/**
 * Collects console errors and uncaught page errors of every page in the context. Chromium's
 * "Failed to load resource: … status of 4xx" lines pass only for requests the test declared with `expectFailure`.
 */
export class ConsoleGuard {
  private problems: string[] = [];
  private expected: ExpectedFailure[] = [];
  private readonly pages = new WeakSet<Page>();

  constructor(context: BrowserContext) {
    for (const p of context.pages()) this.watch(p);
    context.on('page', (p) => this.watch(p));
  }

  /** Declare that a request whose URL matches `url` is meant to answer `status` in this test. */
  expectFailure(url: RegExp, status: number): void {
    this.expected.push({ url, status });
  }

  /** Start a new test: no problems, no declared failures. */
  reset(): void {
    this.problems = [];
    this.expected = [];
  }

  /** Throws when anything unexpected was logged since the last reset. */
  check(): void {
    const found = this.problems;
    this.problems = [];
    if (found.length) throw new Error(`Unexpected browser console output:\n${found.join('\n')}`);
  }

  private watch(page: Page): void {
    if (this.pages.has(page)) return;
    this.pages.add(page);
    page.on('console', (m) => this.onConsole(m));
    page.on('pageerror', (e) => this.problems.push(`pageerror: ${e.message}`));
  }

  private onConsole(m: ConsoleMessage): void {
    if (m.type() !== 'error') return;
    const text = m.text();
    const url = m.location().url;
    const failed = /^Failed to load resource: the server responded with a status of (\d{3})/.exec(text);
    if (failed) {
      const status = Number(failed[1]);
      if (status >= 400 && status < 500 && this.expected.some((e) => e.status === status && e.url.test(url))) return;
    }
    this.problems.push(`console.error: ${text}${url ? ` (${url})` : ''}`);
  }
}

/** What a test file gets from `useBrowser`. */
export type BrowserHarness = {
  readonly context: BrowserContext;
  readonly guard: ConsoleGuard;
  /** The one page of the file (the persistent context's first tab). */
  readonly page: Page;
};

/**
 * Register the hooks of a browser test file: launch before all, close after all, and check the console
 * after each test (an unexpected console error fails that test).
 */
export function useBrowser(viewport?: Viewport): BrowserHarness {
  let launched: Awaited<ReturnType<typeof launch>> | undefined;
  let guard: ConsoleGuard | undefined;
  let page: Page | undefined;
  beforeAll(async () => {
    launched = await launch(viewport);
    guard = new ConsoleGuard(launched.context);
    page = launched.context.pages()[0] ?? (await launched.context.newPage());
  });
  afterAll(async () => {
    await launched?.close();
  });
  beforeEach(() => guard?.reset());
  afterEach(() => guard?.check());
  return {
    get context() {
      if (!launched) throw new Error('browser not launched');
      return launched.context;
    },
    get guard() {
      if (!guard) throw new Error('browser not launched');
      return guard;
    },
    get page() {
      if (!page) throw new Error('browser not launched');
      return page;
    },
  };
}

/** Go to a path of the app. */
export async function open(page: Page, pathname: string): Promise<void> {
  await page.goto(`${baseUrl()}${pathname}`);
  await waitForIslands(page);
}

/**
 * Wait until every island the page loads at once (`client:load`) has hydrated: Astro drops the island's `ssr`
 * attribute then. A click before that lands on server-rendered HTML without handlers and is lost, which made tests
 * flaky on a busy machine. Islands that hydrate when visible are not waited for.
 */
export async function waitForIslands(page: Page): Promise<void> {
  await page.waitForFunction(() => [...document.querySelectorAll('astro-island[client="load"]')].every((el) => !el.hasAttribute('ssr')));
}

/** The path and query of the page's current URL. */
export function pathOf(page: Page): string {
  const u = new URL(page.url());
  return u.pathname + u.search;
}

/** The body rows of a table (rows that hold cells, not header cells). */
export function bodyRows(table: Locator): Locator {
  return table.locator('tbody').getByRole('row');
}

/** The text of each body row's cell under the column whose header matches `header` (or of the cell's first link). */
export async function columnTexts(table: Locator, header: RegExp, opts: { firstLink?: boolean } = {}): Promise<string[]> {
  return table.evaluate(
    (el, { source, flags, firstLink }) => {
      const re = new RegExp(source, flags);
      const t = el as HTMLTableElement;
      // Only this table's own header and rows (:scope), never those of a table nested in one of its cells.
      const heads = [...t.querySelectorAll(':scope > thead > tr > th')].map((th) => (th.textContent ?? '').replace(/[↕▲▼]/g, '').trim());
      const idx = heads.findIndex((h) => re.test(h));
      if (idx < 0) throw new Error(`no column ${re} among ${heads.join(' | ')}`);
      return [...t.querySelectorAll(':scope > tbody > tr')]
        .filter((tr) => tr.children.length > idx && (tr.children[0] as HTMLTableCellElement).colSpan === 1)
        .map((tr) => {
          const cell = tr.children[idx] as HTMLElement;
          const target = firstLink ? cell.querySelector('a') : cell;
          return (target?.innerText ?? '').trim();
        });
    },
    { source: header.source, flags: header.flags, firstLink: opts.firstLink ?? false },
  );
}
