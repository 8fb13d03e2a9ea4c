import { defineConfig } from "vitest/config";

/** Slow statistical checks with fixed seeds (minutes to an hour): `npm run test:slow`. Not part of CI. */
export default defineConfig({
  test: {
    include: ["test/slow/**/*.test.ts"],
    testTimeout: 3_600_000,
    pool: "forks",
  },
});
