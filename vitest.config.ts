import { defineConfig } from "vitest/config";

/**
 * The default suite (`npm test`, run by CI). Slow statistical checks live in test/slow and run with
 * `npm run test:slow` (vitest.slow.config.ts).
 */
export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    exclude: ["test/slow/**", "**/node_modules/**"],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: "forks",
  },
});
