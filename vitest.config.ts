import { defineConfig } from 'vitest/config';
import path from 'node:path';

const root = import.meta.dirname;

export default defineConfig({
  resolve: {
    alias: {
      '@': path.resolve(root),
      // Tests run outside React Server Components; the marker package would throw there.
      'server-only': path.resolve(root, 'tests/helpers/empty.ts'),
    },
  },
  test: {
    // A guard, not a timing: the accuracy tests fit dozens of runs and a shared CI machine may be busy.
    testTimeout: 120000,
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: ['analysis/**/*.test.ts', 'db/**/*.test.ts', 'tests/**/*.test.ts', 'app/**/*.test.ts', 'components/**/*.test.ts'],
          exclude: ['node_modules', '.next', '.next-test', '.data', 'tests/integration/**', 'tests/browser/**'],
        },
      },
      {
        extends: true,
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          setupFiles: ['tests/integration/setup.ts'],
          fileParallelism: false,
        },
      },
    ],
  },
});
