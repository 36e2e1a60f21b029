// Astro configuration. Edit when adding an integration or a host the app is served on.
// NOTE: security.allowedDomains is fixed at build time (see docs/decisions/006-hosts-and-origin.md).
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import auth from 'auth-astro';

const extraHosts = (process.env.SEEPLINE_HOSTS ?? '')
  .split(',')
  .map((h) => h.trim())
  .filter(Boolean);

export default defineConfig({
  output: 'server',
  adapter: node({ mode: 'standalone' }),
  integrations: [react(), auth()],
  server: { host: process.env.HOST ?? 'localhost', port: Number(process.env.PORT ?? 4321) },
  security: {
    // Our middleware checks Origin for cookie-authenticated writes; Astro's own check would also refuse
    // token-authenticated multipart uploads from scripts, which CONTRACT.md requires to work.
    checkOrigin: false,
    allowedDomains: ['localhost', '127.0.0.1', '[::1]', '0.0.0.0', ...extraHosts].map((hostname) => ({ hostname })),
  },
  vite: {
    plugins: [tailwindcss()],
    ssr: { external: ['better-sqlite3', 'sharp', '@node-rs/argon2'] },
  },
});
