/**
 * Developer tool: sign in as a demo role and screenshot pages in Debian's Chromium.
 * `npx tsx scripts/screenshot.ts BASE_URL ROLE WIDTH OUT_DIR /path [/path …]`
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium } from 'playwright-core';

const [base, role, width, out, ...paths] = process.argv.slice(2);
if (!base || !role || !width || !out || paths.length === 0) {
  console.error('usage: screenshot.ts BASE_URL ROLE WIDTH OUT_DIR /path …');
  process.exit(2);
}
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'seepline-shot-'));
const ctx = await chromium.launchPersistentContext(dir, {
  executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
  headless: true,
  args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
  viewport: { width: Number(width), height: 900 },
});
const page = ctx.pages()[0] ?? (await ctx.newPage());
if (role !== 'none') {
  await page.goto(`${base}/signin`);
  await page.getByLabel('E-mail').fill(`${role}@larkvale.example`);
  await page.getByLabel('Password').fill('seepline-demo');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/signin'), { timeout: 15000 });
}
fs.mkdirSync(out, { recursive: true });
for (const p of paths) {
  await page.goto(base + p);
  await page.waitForLoadState('networkidle');
  const file = path.join(out, `${role}-${width}-${p.replace(/[^a-z0-9]+/gi, '_') || 'root'}.png`);
  await page.screenshot({ path: file, fullPage: true });
  console.log(file);
}
await ctx.close();
fs.rmSync(dir, { recursive: true, force: true });
