import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    // Physics reference runs take seconds each; the default 5 s would make a slow CI box flaky.
    testTimeout: 120_000,
    hookTimeout: 60_000,
  },
});
