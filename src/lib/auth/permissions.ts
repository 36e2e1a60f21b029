/**
 * Who may do what (CONTRACT.md "Who may do what"). The single table every API route and page consults,
 * through src/server/auth.ts on the server and `can()` in islands (to hide controls, never to secure).
 */
export const ROLE_VALUES = ['admin', 'manager', 'supervisor', 'technician', 'viewer'] as const;
export type Role = (typeof ROLE_VALUES)[number];

export type Permission =
  | 'read'
  | 'depot:write'
  | 'module:write'
  | 'import'
  | 'user:write'
  | 'token:write'
  | 'settings:write'
  | 'vehicle:write'
  | 'defect:write'
  | 'trace:write'
  | 'pattern:read'
  | 'pattern:write'
  | 'inspection:write'
  | 'mail:read';

const TABLE: Record<Permission, readonly Role[]> = {
  read: ROLE_VALUES,
  'depot:write': ['admin', 'manager'],
  'module:write': ['admin', 'manager'],
  import: ['admin', 'manager'],
  'user:write': ['admin'],
  'token:write': ['admin'],
  'settings:write': ['admin'],
  'vehicle:write': ['admin', 'manager', 'supervisor'],
  'defect:write': ['admin', 'manager', 'supervisor', 'technician'],
  'trace:write': ['admin', 'manager', 'supervisor', 'technician'],
  'pattern:read': ['admin', 'manager', 'supervisor'],
  'pattern:write': ['admin', 'manager'],
  'inspection:write': ['admin', 'manager', 'supervisor'],
  'mail:read': ['admin'],
};

/** True when the role holds the permission. */
export function can(role: Role, permission: Permission): boolean {
  return TABLE[permission].includes(role);
}

/** Admins and managers see every depot; the others see their assigned depots (a viewer may be given all). */
export function seesAllDepots(role: Role, allDepotsFlag: boolean): boolean {
  return role === 'admin' || role === 'manager' || (role === 'viewer' && allDepotsFlag);
}

/** Human label of a role. */
export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  manager: 'Fleet manager',
  supervisor: 'Depot supervisor',
  technician: 'Technician',
  viewer: 'Viewer',
};
