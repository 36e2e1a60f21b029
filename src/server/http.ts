/**
 * HTTP helpers shared by every API route: the one error shape of CONTRACT.md, the `handle()` wrapper that
 * turns thrown HttpError/ZodError into it, and body/query readers. Edit when adding an error code.
 */
import type { APIContext, APIRoute } from 'astro';
import { ZodError, type ZodType, z } from 'zod';
import { logger } from './logger';

export type ErrorCode =
  | 'UNAUTHENTICATED'
  | 'FORBIDDEN'
  | 'NOT_FOUND'
  | 'INVALID_INPUT'
  | 'CONFLICT'
  | 'PAYLOAD_TOO_LARGE'
  | 'UNSUPPORTED_MEDIA_TYPE'
  | 'METHOD_NOT_ALLOWED'
  | 'TOO_MANY_REQUESTS'
  | 'INTERNAL';

export type ErrorIssue = { path?: string; row?: number; column?: string; message: string };

/** An error with an HTTP status and a machine-readable code; `handle()` renders it. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly issues?: ErrorIssue[],
    readonly extra?: Record<string, unknown>,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

export const unauthenticated = (message = 'Sign in or send an API token (Authorization: Bearer …).') =>
  new HttpError(401, 'UNAUTHENTICATED', message);
export const forbidden = (message = 'Your role does not allow this.') => new HttpError(403, 'FORBIDDEN', message);
export const notFound = (what = 'Record') => new HttpError(404, 'NOT_FOUND', `${what} not found.`);
export const invalid = (message: string, issues?: ErrorIssue[], status = 400) =>
  new HttpError(status, 'INVALID_INPUT', message, issues);
export const conflict = (message: string, extra?: Record<string, unknown>) =>
  new HttpError(409, 'CONFLICT', message, undefined, extra);

/** Flatten a zod error into readable issues. */
export function zodIssues(err: ZodError): ErrorIssue[] {
  return err.issues.map((i) => ({ path: i.path.join('.') || undefined, message: i.message }));
}

/** Render an error in the contract's shape. */
export function errorResponse(err: HttpError): Response {
  const body: Record<string, unknown> = {
    error: { code: err.code, message: err.message, ...(err.issues ? { issues: err.issues } : {}) },
    ...(err.extra ?? {}),
  };
  return Response.json(body, { status: err.status });
}

/** Map anything thrown into a Response; unknown errors are logged and answered with a generic 500. */
export function toErrorResponse(err: unknown): Response {
  if (err instanceof HttpError) return errorResponse(err);
  if (err instanceof ZodError) {
    const issues = zodIssues(err);
    return errorResponse(invalid(issues[0] ? describeIssue(issues[0]) : 'Invalid input.', issues));
  }
  if (err instanceof SyntaxError) return errorResponse(invalid('The request body is not valid JSON.'));
  logger.error({ err }, 'unhandled error in API route');
  return errorResponse(new HttpError(500, 'INTERNAL', 'Something went wrong on our side; it has been logged.'));
}

function describeIssue(i: ErrorIssue): string {
  return i.path ? `${i.path}: ${i.message}` : i.message;
}

/** Wrap a route handler so that every failure comes out in the error shape. */
export function handle(fn: (ctx: APIContext) => Promise<Response> | Response): APIRoute {
  return async (ctx) => {
    try {
      return await fn(ctx);
    } catch (err) {
      return toErrorResponse(err);
    }
  };
}

/** Largest JSON body we accept. */
export const MAX_JSON_BYTES = 1024 * 1024;

/** Read and parse a JSON object body against a schema; bad JSON or shape is a 400. */
export async function readJson<T>(ctx: APIContext, schema: ZodType<T>): Promise<T> {
  const type = ctx.request.headers.get('content-type') ?? '';
  if (!type.includes('json')) {
    throw new HttpError(415, 'UNSUPPORTED_MEDIA_TYPE', 'Send the body as application/json.');
  }
  const text = await readTextLimited(ctx.request, MAX_JSON_BYTES);
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch {
    throw invalid('The request body is not valid JSON.');
  }
  return schema.parse(normaliseKeys(data));
}

/** Read a request body as text, refusing anything over `limit` bytes with 413. */
export async function readTextLimited(request: Request, limit: number): Promise<string> {
  const bytes = await readBytesLimited(request, limit);
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw invalid('The request body is not valid UTF-8 text.');
  }
}

/** Read a request body as bytes, refusing anything over `limit` bytes with 413. */
export async function readBytesLimited(request: Request, limit: number): Promise<Uint8Array> {
  const declared = Number(request.headers.get('content-length') ?? '0');
  if (declared > limit) throw tooLarge(limit);
  if (!request.body) return new Uint8Array();
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel();
      throw tooLarge(limit);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let off = 0;
  for (const c of chunks) {
    out.set(c, off);
    off += c.byteLength;
  }
  return out;
}

/** 413 with the limit in words. */
export function tooLarge(limit: number): HttpError {
  return new HttpError(413, 'PAYLOAD_TOO_LARGE', `The upload is larger than the limit of ${formatBytes(limit)}.`);
}

function formatBytes(n: number): string {
  return n >= 1024 * 1024 ? `${Math.round(n / 1024 / 1024)} MB` : `${Math.round(n / 1024)} KB`;
}

/** Accept snake_case keys (as in the CSV formats) as well as camelCase in JSON bodies. */
export function normaliseKeys(data: unknown): unknown {
  if (!data || typeof data !== 'object' || Array.isArray(data)) return data;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(data as Record<string, unknown>)) {
    const camel = k.trim().replace(/_([a-z0-9])/g, (_, c: string) => c.toUpperCase());
    if (!(camel in out)) out[camel] = v;
  }
  return out;
}

/** Parse URL query parameters against a schema (400 with issues on failure). */
export function readQuery<T>(ctx: APIContext, schema: ZodType<T>): T {
  const obj: Record<string, string> = {};
  for (const [k, v] of ctx.url.searchParams) obj[k] = v;
  const r = schema.safeParse(obj);
  if (!r.success) {
    const issues = zodIssues(r.error);
    throw invalid(`Bad query parameter: ${issues.map(describeIssue).join('; ')}`, issues);
  }
  return r.data;
}

/** Parse a path parameter as a positive integer id; anything else is 404 (not disclosed, not a 500). */
export function idParam(value: string | undefined, what: string): number {
  const r = z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER).safeParse(value);
  if (!r.success || !/^\d+$/.test(value ?? '')) throw notFound(what);
  return r.data;
}

/** JSON response helper with a status. */
export function json(body: unknown, status = 200): Response {
  return Response.json(body, { status });
}

/** Fallback handler for methods a route does not serve. */
export function methodNotAllowed(allow: string): APIRoute {
  return handle((ctx) => {
    if (!ctx.locals.user) throw unauthenticated();
    return Response.json(
      { error: { code: 'METHOD_NOT_ALLOWED', message: `${ctx.request.method} is not supported here; use ${allow}.` } },
      { status: 405, headers: { allow } },
    );
  });
}
