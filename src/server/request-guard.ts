/**
 * The one place every request passes through (called by src/middleware.ts): resolves the caller from a
 * Bearer token or the auth-astro session, refuses unauthenticated API calls (401) and cross-site
 * cookie-authenticated writes (403), and sends signed-out visitors of pages to the sign-in page.
 * Role and depot checks follow in each route through src/server/auth.ts.
 */
import { STATUS_CODES } from 'node:http';
import type { APIContext, MiddlewareNext } from 'astro';
import { can } from '@/lib/auth/permissions';
import { pageArea } from '@/lib/auth/page-access';
import type { SessionUser } from './auth';
import { errorResponse, forbidden, HttpError, unauthenticated } from './http';
import { loadSessionUser, userForToken } from './users';

/** Reads the session's user id from the request (auth-astro in production, a fixed reader in tests). */
export type SessionReader = (request: Request) => Promise<{ user?: { id?: string } } | null>;

const PUBLIC_PAGES = new Set(['/signin', '/signout']);
/** The Auth.js actions Seepline uses or that Auth.js answers on its own (credentials sign-in only). */
const AUTH_ACTIONS = new Set(['csrf', 'session', 'providers', 'signin', 'signout', 'callback', 'error', 'verify-request']);
const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
/** The page shown (status 403) when a role may not open an area; see src/pages/not-allowed.astro. */
export const NOT_ALLOWED_PAGE = '/not-allowed';

/** Paths that need no sign-in. */
export function isPublicPath(path: string): boolean {
  return (
    path.startsWith('/api/auth/') ||
    path === '/api/health' ||
    PUBLIC_PAGES.has(path) ||
    path.startsWith('/_astro/') ||
    path.startsWith('/fonts/') ||
    path === '/favicon.svg' ||
    path === '/robots.txt'
  );
}

/** Resolve the caller; `invalidToken` when a Bearer token was sent but is not valid. */
export async function resolveCaller(
  request: Request,
  readSession: SessionReader,
): Promise<{ user: SessionUser | null; invalidToken: boolean }> {
  const auth = request.headers.get('authorization');
  if (auth) {
    const m = /^Bearer\s+(\S+)\s*$/i.exec(auth);
    const user = m?.[1] ? userForToken(m[1]) : null;
    return { user, invalidToken: !user };
  }
  let session: Awaited<ReturnType<SessionReader>> = null;
  try {
    session = await readSession(request);
  } catch {
    session = null;
  }
  const id = Number(session?.user?.id);
  return { user: Number.isInteger(id) && id > 0 ? loadSessionUser(id, 'session') : null, invalidToken: false };
}

/** Same-origin check for cookie-authenticated writes (browsers always send Origin on cross-site POSTs). */
export function isCrossSite(request: Request): boolean {
  const origin = request.headers.get('origin');
  if (!origin || origin === 'null') return origin === 'null';
  const host = request.headers.get('x-forwarded-host') ?? request.headers.get('host');
  try {
    return new URL(origin).host !== host;
  } catch {
    return true;
  }
}

/** The middleware body. */
export async function guardRequest(ctx: APIContext, next: MiddlewareNext, readSession: SessionReader): Promise<Response> {
  const path = ctx.url.pathname.replace(/\/+$/, '') || '/';
  const isApi = path === '/api' || path.startsWith('/api/');
  if (path.startsWith('/api/auth/')) {
    // Auth.js answers its own actions; anything else under /api/auth (an unknown action, one of a provider we do
    // not run) would end in a bare 500 inside the library, so it gets the error shape here instead.
    const action = path.slice('/api/auth/'.length).split('/')[0] ?? '';
    if (!AUTH_ACTIONS.has(action)) return errorResponse(new HttpError(404, 'NOT_FOUND', `There is no sign-in route ${path}.`));
    return next();
  }
  const { user, invalidToken } = await resolveCaller(ctx.request, readSession);
  if (user) ctx.locals.user = user;
  if (isApi) {
    if (path === '/api/health') return next();
    if (invalidToken) return errorResponse(unauthenticated('The API token is not valid or has been revoked.'));
    if (!user) return errorResponse(unauthenticated());
    if (user.via === 'session' && UNSAFE.has(ctx.request.method) && isCrossSite(ctx.request)) {
      return errorResponse(forbidden('Cross-site request refused: the Origin header does not match this site.'));
    }
    return next();
  }
  if (!user && !isPublicPath(path)) {
    const back = path === '/' ? '' : `?next=${encodeURIComponent(path + ctx.url.search)}`;
    return ctx.redirect(`/signin${back}`, 302);
  }
  // A page of an area the role may not open: say so (403) on the page asked for, instead of sending the
  // person elsewhere without a word.
  const area = user ? pageArea(path) : null;
  if (user && area && !can(user.role, area.permission)) {
    ctx.locals.denied = { area: area.area, who: area.who, path };
    return withReasonPhrase(await next(NOT_ALLOWED_PAGE));
  }
  return withReasonPhrase(await next());
}

/**
 * Astro answers a page that sets its own status (404, 403) with the reason phrase "OK"; give such a response the
 * standard phrase ("Not Found", "Forbidden") so that the status line is honest.
 */
export function withReasonPhrase(res: Response): Response {
  if (res.status === 200 || (res.statusText && res.statusText !== 'OK')) return res;
  const phrase = STATUS_CODES[res.status];
  if (!phrase || res.status < 200) return res;
  return new Response(res.body, { status: res.status, statusText: phrase, headers: res.headers });
}
