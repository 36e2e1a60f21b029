/** The server's structured logger (pino). */
import pino from 'pino';

export const logger = pino({
  level: process.env.LOG_LEVEL ?? (process.env.VITEST ? 'silent' : 'info'),
  base: undefined,
});
