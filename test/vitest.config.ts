import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    root: new URL('..', import.meta.url).pathname,
    include: ['test/**/*.test.ts'],
    // Hang guards only: every test is bounded by its work, never by how fast this machine is today.
    testTimeout: 300_000,
    hookTimeout: 300_000,
  },
});
