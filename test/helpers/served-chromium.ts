import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { launchChromium, type HeadlessBrowser } from "./headless-chromium.js";
import { serveFolder, type StaticServer } from "./static-server.js";

/** A site built into a scratch folder, served on the loopback address and opened in headless Chromium. */
export interface ServedChromium {
  /** The scratch folder (removed by `close`). */
  readonly dir: string;
  readonly server: StaticServer;
  readonly chromium: HeadlessBrowser;
  /** Closes Chromium and the server and removes the scratch folder. */
  close(): Promise<void>;
}

/**
 * The set-up of the browser tests: a scratch folder named from `prefix`, the site that `buildSite` writes
 * into it (it returns the folder to serve), a static server for that folder and a headless Chromium.
 */
export async function servedChromium(prefix: string, buildSite: (dir: string) => Promise<string>): Promise<ServedChromium> {
  const dir = await mkdtemp(join(tmpdir(), prefix));
  const server = await serveFolder(await buildSite(dir));
  const chromium = await launchChromium();
  return {
    dir,
    server,
    chromium,
    async close() {
      await chromium.close();
      await server.close();
      await rm(dir, { recursive: true, force: true });
    },
  };
}
