/**
 * Guards every API route and page uses, in this order: who is calling (set on locals by the middleware,
 * from the session cookie or a Bearer token), whether their role allows the action, and whether a record
 * lies inside their depots (outside → 404 so that its existence is not disclosed).
 */
import type { APIContext, AstroGlobal } from 'astro';
import { can, type Permission } from '@/lib/auth/permissions';
import { forbidden, notFound, unauthenticated } from './http';
import type { SessionUser } from '@/lib/auth/session-user';

export type { SessionUser };

type Ctx = Pick<APIContext, 'locals'> | Pick<AstroGlobal, 'locals'>;

/** The signed-in caller, or 401. */
export function requireUser(ctx: Ctx): SessionUser {
  const user = ctx.locals.user;
  if (!user) throw unauthenticated();
  return user;
}

/** The caller if their role holds `permission`, else 403. */
export function requirePermission(ctx: Ctx, permission: Permission): SessionUser {
  const user = requireUser(ctx);
  if (!can(user.role, permission)) throw forbidden(forbiddenMessage(permission));
  return user;
}

/** True when the depot is inside the caller's scope. */
export function inScope(user: SessionUser, depotId: number): boolean {
  return user.depotIds === null || user.depotIds.includes(depotId);
}

/** Throw 404 (never 403) for a record in a depot outside the caller's scope. */
export function requireDepotScope(user: SessionUser, depotId: number, what: string): void {
  if (!inScope(user, depotId)) throw notFound(what);
}

function forbiddenMessage(p: Permission): string {
  const words: Partial<Record<Permission, string>> = {
    import: 'Imports are for admins and fleet managers.',
    'depot:write': 'Depots are changed by admins and fleet managers.',
    'module:write': 'The module catalogue is changed by admins and fleet managers.',
    'user:write': 'People are managed by admins.',
    'token:write': 'API tokens are managed by admins.',
    'vehicle:write': 'Vehicles are changed by supervisors, fleet managers and admins.',
    'defect:write': 'Your role can read defects but not change them.',
    'trace:write': 'Your role can read traces but not add them.',
    'pattern:read': 'Patterns are for supervisors, fleet managers and admins.',
    'pattern:write': 'Patterns are acted on by fleet managers and admins.',
  };
  return words[p] ?? 'Your role does not allow this.';
}

/** The audit actor for a caller. */
export function actorOf(user: SessionUser): { userId: number } {
  return { userId: user.id };
}
