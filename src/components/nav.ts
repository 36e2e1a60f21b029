/** The navigation: only areas that exist, filtered by what the role may do. */
import { can, type Permission, type Role } from '@/lib/auth/permissions';

export type NavItem = { key: string; label: string; href: string; permission: Permission; icon: string };

export const NAV_ITEMS: NavItem[] = [
  { key: 'overview', label: 'Overview', href: '/', permission: 'read', icon: 'M3 12l9-8 9 8M5 10v10h14V10' },
  { key: 'defects', label: 'Defects', href: '/defects', permission: 'read', icon: 'M12 3l9 16H3zM12 10v4M12 17h.01' },
  { key: 'vehicles', label: 'Vehicles', href: '/vehicles', permission: 'read', icon: 'M3 16V8h11l4 4h3v4M6 19a2 2 0 100-4 2 2 0 000 4zM17 19a2 2 0 100-4 2 2 0 000 4z' },
  { key: 'patterns', label: 'Patterns', href: '/patterns', permission: 'pattern:read', icon: 'M3 20h18M6 16v-4M10 16V8M14 16v-6M18 16V5' },
  { key: 'traces', label: 'Traces', href: '/traces', permission: 'read', icon: 'M2 12h3l2-6 3 12 3-9 2 5 2-2h5' },
  { key: 'depots', label: 'Depots', href: '/depots', permission: 'read', icon: 'M3 21V9l9-5 9 5v12M9 21v-6h6v6' },
  { key: 'modules', label: 'Modules', href: '/modules', permission: 'read', icon: 'M4 4h16v16H4zM4 10h16M10 4v16' },
  { key: 'import', label: 'Import', href: '/import', permission: 'import', icon: 'M12 3v12M7 10l5 5 5-5M4 19h16' },
  { key: 'people', label: 'People', href: '/people', permission: 'user:write', icon: 'M16 11a4 4 0 10-8 0 4 4 0 008 0zM4 21a8 8 0 0116 0' },
  { key: 'settings', label: 'Settings', href: '/settings', permission: 'settings:write', icon: 'M4 6h10M18 6h2M4 12h4M12 12h8M4 18h12M20 18h0M16 4v4M10 10v4M18 16v4' },
];

/** The items a role sees. */
export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((i) => can(role, i.permission));
}
