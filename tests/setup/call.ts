// Calls a real route module through the real request guard (the middleware's body), with a Bearer token.
import type { APIContext, APIRoute } from 'astro';
import { guardRequest } from '../../src/server/request-guard';

type RouteModule = Partial<Record<'GET' | 'POST' | 'PATCH' | 'DELETE' | 'PUT' | 'ALL', APIRoute>>;

export type CallOptions = {
  token?: string;
  params?: Record<string, string>;
  json?: unknown;
  body?: BodyInit;
  headers?: Record<string, string>;
  /** Pretend a session cookie belongs to this user id (for CSRF tests). */
  sessionUserId?: number;
};

/** Call `route[method]` for `url` and return the Response. */
export async function call(route: RouteModule, method: string, url: string, o: CallOptions = {}): Promise<Response> {
  const headers = new Headers(o.headers ?? {});
  if (o.token) headers.set('authorization', `Bearer ${o.token}`);
  let body = o.body;
  if (o.json !== undefined) {
    headers.set('content-type', 'application/json');
    body = JSON.stringify(o.json);
  }
  const full = new URL(url, 'http://localhost:4321');
  const request = new Request(full, { method, headers, body });
  const ctx = {
    request,
    url: full,
    params: o.params ?? {},
    locals: {},
    redirect: (to: string, status = 302) => new Response(null, { status, headers: { location: to } }),
  } as unknown as APIContext;
  const handler = (route as Record<string, APIRoute | undefined>)[method] ?? route.ALL;
  const readSession = async () => (o.sessionUserId ? { user: { id: String(o.sessionUserId) } } : null);
  return guardRequest(ctx, async () => (handler ? handler(ctx) : new Response('no handler', { status: 405 })), readSession);
}

/** Response JSON. */
export async function body<T = any>(res: Response): Promise<T> {
  return (await res.json()) as T;
}
