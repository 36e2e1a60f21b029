import { handle, idParam, notFound, methodNotAllowed } from '@/server/http';
import { requirePermission, actorOf } from '@/server/auth';
import { revokeToken } from '@/server/users';

export const DELETE = handle((ctx) => {
  const me = requirePermission(ctx, 'token:write');
  if (!revokeToken(idParam(ctx.params.id, 'Token'), actorOf(me))) throw notFound('Token');
  return new Response(null, { status: 204 });
});

export const ALL = methodNotAllowed('DELETE');
