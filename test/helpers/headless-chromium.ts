import { existsSync } from "node:fs";
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";

/** Debian's Chromium, installed by .ci/setup-browser.sh. */
export const CHROMIUM = "/usr/bin/chromium";

/** Flags for a quiet headless Chromium that talks to no service of its own (updates, sync, field trials). */
export const CHROMIUM_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

/** On a developer machine without Chromium the browser tests are skipped; in CI a missing browser is a failure. */
export const skipWithoutChromium = !existsSync(CHROMIUM) && !process.env["CI"];

/** A running browser with a fresh profile folder, and how to stop it and remove the folder. */
export interface HeadlessBrowser {
  /** The browser's one context (its profile is the fresh folder); open pages with `context.newPage()`. */
  readonly context: BrowserContext;
  close(): Promise<void>;
}

/**
 * Launches Debian's Chromium headless with a fresh user-data folder (playwright passes it as
 * `--user-data-dir`), removed again by `close`. Downloads are accepted.
 */
export async function launchChromium(viewport = { width: 1100, height: 900 }): Promise<HeadlessBrowser> {
  if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is missing; .ci/setup-browser.sh installs Debian's chromium`);
  const profile = await mkdtemp(join(tmpdir(), "horologium-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    args: CHROMIUM_ARGS,
    headless: true,
    acceptDownloads: true,
    viewport,
  });
  return {
    context,
    async close() {
      await context.close();
      await rm(profile, { recursive: true, force: true });
    },
  };
}

/** What a page did that a test should see: console errors, uncaught exceptions and requests off its own origin. */
export interface PageWatch {
  readonly consoleErrors: string[];
  readonly offOriginRequests: string[];
}

/**
 * Records the console errors, page errors and every request whose URL is not on `origin` (a blob: URL
 * made by the page counts as on it; `file:` pages pass "file:").
 */
export function watchPage(page: Page, origin: string): PageWatch {
  const watch: PageWatch = { consoleErrors: [], offOriginRequests: [] };
  page.on("console", (message) => {
    if (message.type() === "error") watch.consoleErrors.push(message.text());
  });
  page.on("pageerror", (error) => watch.consoleErrors.push(`page error: ${error.message}`));
  page.on("request", (request) => {
    const url = request.url();
    if (!url.startsWith(origin) && !url.startsWith(`blob:${origin}`) && !url.startsWith("data:")) watch.offOriginRequests.push(url);
  });
  return watch;
}
