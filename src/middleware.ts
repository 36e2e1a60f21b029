// Reads the session once per request and applies the shared guard (src/server/request-guard.ts).
import { defineMiddleware } from 'astro:middleware';
import { getSession } from 'auth-astro/server';
import { guardRequest } from './server/request-guard';

export const onRequest = defineMiddleware((ctx, next) =>
  guardRequest(ctx, next, (request) => getSession(request) as Promise<{ user?: { id?: string } } | null>),
);
