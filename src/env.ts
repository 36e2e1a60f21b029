/**
 * Server environment, parsed once with zod. Imported only by server code (src/server, src/db, src/cli).
 * Edit when adding a setting; document it in .env.example too.
 */
import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import { z } from 'zod';

const EnvSchema = z.object({
  DATABASE_URL: z.string().min(1).default('./data/seepline.db'),
  UPLOAD_DIR: z.string().min(1).default('./data/uploads'),
  AUTH_SECRET: z.string().min(16).optional(),
  SMTP_URL: z.string().optional(),
  MAIL_FROM: z.string().default('Seepline <digest@seepline.local>'),
  SEED_DEMO: z.enum(['0', '1']).default('1'),
  HOST: z.string().default('localhost'),
  PORT: z.coerce.number().int().min(0).max(65535).default(4321),
  LOG_LEVEL: z.string().default('info'),
});

export type Env = z.infer<typeof EnvSchema>;

/** Parsed environment; empty strings count as unset. */
export function getEnv(): Env {
  const raw = Object.fromEntries(Object.entries(process.env).filter(([, v]) => v !== undefined && v !== ''));
  return EnvSchema.parse(raw);
}

/** The SQLite path with a `file:` prefix (as some tools write it) removed, resolved from the working dir. */
export function databasePath(env: Env = getEnv()): string {
  const p = env.DATABASE_URL.replace(/^file:/, '');
  return p === ':memory:' ? p : path.resolve(p);
}

/** Directory for uploaded files. */
export function uploadDir(env: Env = getEnv()): string {
  return path.resolve(env.UPLOAD_DIR);
}

/**
 * AUTH_SECRET from the environment, or one generated into the data directory (beside the database) and kept
 * there, so that sessions survive restarts. NOTE: auth-astro would read import.meta.env at build time;
 * we pass this at run time instead (STACK.md gotcha 1).
 */
export function ensureAuthSecret(env: Env = getEnv()): string {
  if (env.AUTH_SECRET) return env.AUTH_SECRET;
  const dbPath = databasePath(env);
  const dir = dbPath === ':memory:' ? path.resolve('./data') : path.dirname(dbPath);
  const file = path.join(dir, 'auth-secret');
  try {
    const existing = fs.readFileSync(file, 'utf8').trim();
    if (existing.length >= 32) {
      process.env.AUTH_SECRET = existing;
      return existing;
    }
  } catch {
    // not there yet
  }
  fs.mkdirSync(dir, { recursive: true });
  const secret = crypto.randomBytes(32).toString('base64url');
  fs.writeFileSync(file, secret + '\n', { mode: 0o600 });
  process.env.AUTH_SECRET = secret;
  return secret;
}
