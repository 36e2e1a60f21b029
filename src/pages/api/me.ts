import { handle, json } from '@/server/http';
import { requireUser } from '@/server/auth';
import { ROLE_LABELS } from '@/lib/auth/permissions';

/** The caller: name, role and depot scope. */
export const GET = handle((ctx) => {
  const u = requireUser(ctx);
  return json({ id: u.id, email: u.email, name: u.name, role: u.role, roleLabel: ROLE_LABELS[u.role], depotIds: u.depotIds, via: u.via });
});
