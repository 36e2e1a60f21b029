import { handle, HttpError } from '@/server/http';
import { requireUser } from '@/server/auth';

/** Any /api path that no route serves: the error shape rather than an HTML page. */
export const ALL = handle((ctx) => {
  requireUser(ctx);
  throw new HttpError(404, 'NOT_FOUND', `There is no API route ${ctx.url.pathname}.`);
});

