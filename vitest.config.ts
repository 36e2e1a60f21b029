// Test projects: unit (pure engines beside src/lib), api (handlers against a real SQLite file),
// browser (built server + Debian Chromium). Edit when adding a project or a setup file.
import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

const alias = { '@': fileURLToPath(new URL('./src', import.meta.url)) };

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: { name: 'unit', include: ['src/**/*.test.ts'], environment: 'node' },
      },
      {
        resolve: { alias },
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/setup/global-setup.ts'],
          setupFiles: ['tests/setup/api-setup.ts'],
          testTimeout: 30000,
          hookTimeout: 60000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'browser',
          include: ['tests/browser/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/browser/global-setup.ts'],
          testTimeout: 60000,
          hookTimeout: 300000,
          pool: 'forks',
          poolOptions: { forks: { singleFork: true } },
        },
      },
    ],
    coverage: { include: ['src/lib/**'], thresholds: { lines: 80, functions: 80 } },
  },
});
