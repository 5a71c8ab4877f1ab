import { defineConfig } from 'vitest/config';
import path from 'node:path';

export default defineConfig({
  resolve: { alias: { '@': path.resolve(import.meta.dirname) } },
  test: {
    include: ['analysis/**/*.test.ts', 'db/**/*.test.ts', 'tests/**/*.test.ts', 'app/**/*.test.ts', 'components/**/*.test.ts'],
    exclude: ['node_modules', '.next', '.data'],
    testTimeout: 30000,
  },
});
