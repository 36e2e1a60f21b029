import { handle, notFound } from '@/server/http';
import { requireUser } from '@/server/auth';

/** Any /api path that no route serves: the error shape rather than an HTML page. */
export const ALL = handle((ctx) => {
  requireUser(ctx);
  throw notFound(`No API route ${ctx.url.pathname}; it`);
});

