/**
 * Which pages need more than being signed in: the area a path belongs to and the permission its pages ask for.
 * The request guard consults it before any page renders, so that a person whose role does not open an area sees
 * the "not for your role" page (403) instead of being sent elsewhere without a word. API routes check their own
 * permissions (src/server/auth.ts); this table is only about pages.
 */
import type { Permission } from './permissions';

/** A restricted area of the app: its name in the navigation, the permission its pages need, and who holds it. */
export type PageArea = { area: string; permission: Permission; who: string };

const AREAS: Array<{ prefix: string } & PageArea> = [
  { prefix: '/patterns', area: 'Patterns', permission: 'pattern:read', who: 'depot supervisors, fleet managers and admins' },
  { prefix: '/import', area: 'Import', permission: 'import', who: 'fleet managers and admins' },
  { prefix: '/people', area: 'People', permission: 'user:write', who: 'admins' },
  { prefix: '/settings', area: 'Settings', permission: 'settings:write', who: 'admins' },
];

/** The restricted area of a page path (`/patterns/2` → Patterns), or null for pages every signed-in role opens. */
export function pageArea(pathname: string): PageArea | null {
  const path = pathname.replace(/\/+$/, '') || '/';
  for (const a of AREAS) {
    if (path === a.prefix || path.startsWith(`${a.prefix}/`)) return { area: a.area, permission: a.permission, who: a.who };
  }
  return null;
}
