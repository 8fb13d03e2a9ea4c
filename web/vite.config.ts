import { fileURLToPath } from "node:url";
import { defineConfig } from "vite";

/**
 * The browser page (`npm run build:web`): a static site in dist/web/ with relative asset paths, so
 * it works from any static file server, under any path, and offline.
 */
export default defineConfig({
  root: fileURLToPath(new URL(".", import.meta.url)),
  base: "./",
  publicDir: false,
  logLevel: "warn",
  build: {
    outDir: fileURLToPath(new URL("../dist/web", import.meta.url)),
    emptyOutDir: true,
    target: "es2022",
    // One worker chunk and one page chunk of a few MB: nothing to gain from a size warning.
    chunkSizeWarningLimit: 8000,
    sourcemap: false,
    // The slow step is compiling the worker's imports, not a plugin: no timing table on every build.
    rolldownOptions: { checks: { pluginTimings: false } },
  },
  worker: { format: "es" },
});
