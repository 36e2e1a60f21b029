/**
 * Credential checks for sign-in, with throttling: after MAX_FAILURES failed attempts for one e-mail address
 * within WINDOW_MS, that address is locked for LOCK_MS. Unknown and known addresses behave the same (same
 * answer, same time spent), so sign-in does not reveal who has an account.
 */
import { eq } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { signInThrottle, users } from '@/db/schema';
import { verifyAgainstDummy, verifyPassword } from './passwords';

export const MAX_FAILURES = 5;
export const WINDOW_MS = 15 * 60_000;
export const LOCK_MS = 15 * 60_000;

export type SignInResult = { ok: true; user: { id: number; email: string; name: string; role: string } } | { ok: false; reason: 'invalid' | 'locked' };

/** Check an e-mail and password; records failures and successes for throttling. */
export async function checkCredentials(emailRaw: unknown, passwordRaw: unknown, now = Date.now()): Promise<SignInResult> {
  const email = typeof emailRaw === 'string' ? emailRaw.trim().toLowerCase().slice(0, 320) : '';
  const password = typeof passwordRaw === 'string' ? passwordRaw.slice(0, 1024) : '';
  const db = getDb();
  const key = `email:${email}`;
  const t = db.select().from(signInThrottle).where(eq(signInThrottle.key, key)).get();
  if (t?.lockedUntilAt && t.lockedUntilAt > now) {
    await verifyAgainstDummy(password);
    return { ok: false, reason: 'locked' };
  }
  const u = email ? db.select().from(users).where(eq(users.email, email)).get() : undefined;
  let ok = false;
  if (u && u.active && password) ok = await verifyPassword(u.passwordHash, password);
  else await verifyAgainstDummy(password);
  if (ok && u) {
    db.delete(signInThrottle).where(eq(signInThrottle.key, key)).run();
    db.update(users).set({ lastSignInAt: now }).where(eq(users.id, u.id)).run();
    return { ok: true, user: { id: u.id, email: u.email, name: u.name, role: u.role } };
  }
  const inWindow = t && now - t.windowStartAt < WINDOW_MS;
  const failures = (inWindow ? t.failures : 0) + 1;
  const row = {
    key,
    failures,
    windowStartAt: inWindow ? t.windowStartAt : now,
    lockedUntilAt: failures >= MAX_FAILURES ? now + LOCK_MS : null,
  };
  db.insert(signInThrottle).values(row).onConflictDoUpdate({ target: signInThrottle.key, set: row }).run();
  return { ok: false, reason: failures >= MAX_FAILURES ? 'locked' : 'invalid' };
}
