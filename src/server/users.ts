/** People: loading the caller, creating and changing people, API tokens. */
import crypto from 'node:crypto';
import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm';
import { getDb } from '@/db/client';
import { apiTokens, depots, userDepots, users } from '@/db/schema';
import { seesAllDepots, type Role } from '@/lib/auth/permissions';
import type { SessionUser } from './auth';
import { conflict, invalid } from './http';
import { hashPassword } from './passwords';
import { writeAudit, type Actor } from './audit';

/** Load the caller by id, with depot scope; null for an unknown or deactivated person. */
export function loadSessionUser(id: number, via: SessionUser['via']): SessionUser | null {
  const db = getDb();
  const u = db.select().from(users).where(eq(users.id, id)).get();
  if (!u || !u.active) return null;
  const all = seesAllDepots(u.role, u.allDepots);
  const depotIds = all
    ? null
    : db
        .select({ id: userDepots.depotId })
        .from(userDepots)
        .where(eq(userDepots.userId, id))
        .all()
        .map((r) => r.id);
  return { id: u.id, email: u.email, name: u.name, role: u.role, depotIds, via };
}

/** Prefix of every token, so that a leaked one is recognisable in logs and scanners. */
export const TOKEN_PREFIX = 'spl_';

/** SHA-256 hex of a token. Tokens are 256-bit random, so a fast hash is the right tool (no salt needed). */
export function hashToken(token: string): string {
  return crypto.createHash('sha256').update(token).digest('hex');
}

/** Resolve a Bearer token to its person; null when unknown, revoked or the person is inactive. */
export function userForToken(token: string): SessionUser | null {
  if (!token.startsWith(TOKEN_PREFIX) || token.length > 200) return null;
  const db = getDb();
  const row = db
    .select({ id: apiTokens.id, userId: apiTokens.userId, lastUsedAt: apiTokens.lastUsedAt })
    .from(apiTokens)
    .where(and(eq(apiTokens.tokenHash, hashToken(token)), isNull(apiTokens.revokedAt)))
    .get();
  if (!row) return null;
  const now = Date.now();
  // Record use at most once a minute to keep reads cheap.
  if (!row.lastUsedAt || now - row.lastUsedAt > 60_000) {
    db.update(apiTokens).set({ lastUsedAt: now }).where(eq(apiTokens.id, row.id)).run();
  }
  return loadSessionUser(row.userId, 'token');
}

export type NewUser = { email: string; name: string; role: Role; password: string; depots?: string[]; allDepots?: boolean };

/** Resolve depot codes to ids; unknown codes are a 400 naming them. */
export function depotIdsForCodes(codes: string[]): number[] {
  if (codes.length === 0) return [];
  const up = [...new Set(codes.map((c) => c.trim().toUpperCase()).filter(Boolean))];
  const rows = getDb().select({ id: depots.id, code: depots.code }).from(depots).where(inArray(depots.code, up)).all();
  const missing = up.filter((c) => !rows.some((r) => r.code === c));
  if (missing.length) throw invalid(`Unknown depot code${missing.length > 1 ? 's' : ''}: ${missing.join(', ')}.`, missing.map((m) => ({ path: 'depots', message: `Unknown depot ${m}` })));
  return rows.map((r) => r.id);
}

/** Create a person (e-mail unique, case-insensitive). */
export async function createUser(input: NewUser, actor: Actor): Promise<{ id: number }> {
  const db = getDb();
  const email = input.email.trim().toLowerCase();
  if (db.select({ id: users.id }).from(users).where(eq(users.email, email)).get()) {
    throw conflict(`A person with the e-mail ${email} already exists.`);
  }
  const depotIds = depotIdsForCodes(input.depots ?? []);
  if ((input.role === 'supervisor' || input.role === 'technician') && depotIds.length === 0) {
    throw invalid(`A ${input.role} needs at least one depot (--depots / depots).`, [{ path: 'depots', message: 'At least one depot is required for this role.' }]);
  }
  if (input.role === 'viewer' && depotIds.length === 0 && !input.allDepots) {
    throw invalid('A viewer needs at least one depot, or all depots.', [{ path: 'depots', message: 'Give depots or allDepots.' }]);
  }
  const passwordHash = await hashPassword(input.password);
  return db.transaction((tx) => {
    const row = tx
      .insert(users)
      .values({ email, name: input.name.trim(), role: input.role, passwordHash, allDepots: input.allDepots ?? false })
      .returning({ id: users.id })
      .get();
    if (depotIds.length) tx.insert(userDepots).values(depotIds.map((depotId) => ({ userId: row.id, depotId }))).run();
    writeAudit(tx, actor, { entity: 'user', entityId: String(row.id), action: 'create', newValue: `${email} (${input.role})` });
    return { id: row.id };
  });
}

export type UserChange = { name?: string; role?: Role; depots?: string[]; allDepots?: boolean; active?: boolean; password?: string };

/** Change a person's name, role, depots, active flag or password. */
export async function updateUser(id: number, change: UserChange, actor: Actor): Promise<void> {
  const db = getDb();
  const before = db.select().from(users).where(eq(users.id, id)).get();
  if (!before) throw invalid('No such person.');
  const depotIds = change.depots ? depotIdsForCodes(change.depots) : undefined;
  const passwordHash = change.password ? await hashPassword(change.password) : undefined;
  db.transaction((tx) => {
    const set: Partial<typeof users.$inferInsert> = { updatedAt: Date.now() };
    if (change.name !== undefined) set.name = change.name.trim();
    if (change.role !== undefined) set.role = change.role;
    if (change.allDepots !== undefined) set.allDepots = change.allDepots;
    if (change.active !== undefined) set.active = change.active;
    if (passwordHash) set.passwordHash = passwordHash;
    tx.update(users).set(set).where(eq(users.id, id)).run();
    for (const f of ['name', 'role', 'allDepots', 'active'] as const) {
      if (change[f] !== undefined && change[f] !== before[f]) {
        writeAudit(tx, actor, { entity: 'user', entityId: String(id), action: 'update', field: f, oldValue: String(before[f]), newValue: String(change[f]) });
      }
    }
    if (passwordHash) writeAudit(tx, actor, { entity: 'user', entityId: String(id), action: 'update', field: 'password', oldValue: '•••', newValue: '•••' });
    if (depotIds) {
      tx.delete(userDepots).where(eq(userDepots.userId, id)).run();
      if (depotIds.length) tx.insert(userDepots).values(depotIds.map((depotId) => ({ userId: id, depotId }))).run();
      writeAudit(tx, actor, { entity: 'user', entityId: String(id), action: 'update', field: 'depots', newValue: (change.depots ?? []).join(',') });
    }
  });
}

/** Everyone, with their depot codes and token counts. */
export function listUsers() {
  const db = getDb();
  const rows = db.select().from(users).orderBy(asc(users.name)).all();
  const scopes = db
    .select({ userId: userDepots.userId, code: depots.code })
    .from(userDepots)
    .innerJoin(depots, eq(depots.id, userDepots.depotId))
    .all();
  const tokens = db
    .select({ userId: apiTokens.userId, n: sql<number>`count(*)` })
    .from(apiTokens)
    .where(isNull(apiTokens.revokedAt))
    .groupBy(apiTokens.userId)
    .all();
  return rows.map((u) => ({
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    active: u.active,
    allDepots: seesAllDepots(u.role, u.allDepots),
    depots: scopes.filter((s) => s.userId === u.id).map((s) => s.code).sort(),
    activeTokens: tokens.find((t) => t.userId === u.id)?.n ?? 0,
    lastSignInAt: u.lastSignInAt ? new Date(u.lastSignInAt).toISOString() : null,
    createdAt: new Date(u.createdAt).toISOString(),
  }));
}

/** Create an API token for a person; returns the token once (only its hash is kept). */
export function createToken(userId: number, label: string, actor: Actor): { id: number; token: string; prefix: string } {
  const db = getDb();
  const u = db.select({ id: users.id, active: users.active }).from(users).where(eq(users.id, userId)).get();
  if (!u) throw invalid('No such person.');
  if (!u.active) throw invalid('That person is deactivated; tokens cannot be created for them.');
  const token = TOKEN_PREFIX + crypto.randomBytes(32).toString('base64url');
  const prefix = token.slice(0, 10);
  return db.transaction((tx) => {
    const row = tx.insert(apiTokens).values({ userId, label: label.trim() || 'API token', tokenHash: hashToken(token), prefix }).returning({ id: apiTokens.id }).get();
    writeAudit(tx, actor, { entity: 'token', entityId: String(row.id), action: 'create', newValue: `${prefix}… for user ${userId}` });
    return { id: row.id, token, prefix };
  });
}

/** Tokens (never their secret), newest first, optionally for one person. */
export function listTokens(userId?: number) {
  const db = getDb();
  const q = db
    .select({
      id: apiTokens.id,
      userId: apiTokens.userId,
      email: users.email,
      name: users.name,
      label: apiTokens.label,
      prefix: apiTokens.prefix,
      createdAt: apiTokens.createdAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId));
  const rows = (userId ? q.where(eq(apiTokens.userId, userId)) : q).orderBy(sql`${apiTokens.id} desc`).all();
  const iso = (n: number | null) => (n ? new Date(n).toISOString() : null);
  return rows.map((r) => ({ ...r, createdAt: iso(r.createdAt), lastUsedAt: iso(r.lastUsedAt), revokedAt: iso(r.revokedAt) }));
}

/** Revoke a token; revoking twice is harmless. Returns false for an unknown id. */
export function revokeToken(id: number, actor: Actor): boolean {
  const db = getDb();
  const row = db.select().from(apiTokens).where(eq(apiTokens.id, id)).get();
  if (!row) return false;
  if (!row.revokedAt) {
    db.transaction((tx) => {
      tx.update(apiTokens).set({ revokedAt: Date.now() }).where(eq(apiTokens.id, id)).run();
      writeAudit(tx, actor, { entity: 'token', entityId: String(id), action: 'revoke' });
    });
  }
  return true;
}
