import { defineConfig } from 'vitest/config';
import { ClosingLineReporter } from './test/support/closing-line-reporter.js';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: 'forks',
    reporters: ['default', new ClosingLineReporter()],
  },
});
