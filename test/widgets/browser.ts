/**
 * Headless Chromium for widget tests and the B4 benchmark: Debian's /usr/bin/chromium driven by
 * playwright-core in a fresh profile (never a downloaded browser), closed by the caller.
 */
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { mkdtemp, rm } from "node:fs/promises";
import { existsSync } from "node:fs";
import os from "node:os";
import path from "node:path";

export const CHROMIUM = "/usr/bin/chromium";

/** True when Debian's Chromium is installed here. */
export function hasChromium(): boolean {
  return existsSync(CHROMIUM);
}

export interface Browser {
  context: BrowserContext;
  page: Page;
  /** Close the browser and delete its profile folder. */
  close(): Promise<void>;
}

/** Launch Chromium headless in a new temporary profile with a viewport of `width` × `height`. */
export async function launchBrowser(width = 1280, height = 800): Promise<Browser> {
  const profile = await mkdtemp(path.join(os.tmpdir(), "fringekit-chromium-"));
  try {
    const context = await chromium.launchPersistentContext(profile, {
      executablePath: CHROMIUM,
      headless: true,
      acceptDownloads: true,
      viewport: { width, height },
      args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
        "--disable-background-networking", "--disable-component-update", "--disable-sync"],
    });
    const page = context.pages()[0] ?? (await context.newPage());
    return {
      context,
      page,
      close: async () => {
        await context.close().catch(() => undefined);
        await rm(profile, { recursive: true, force: true });
      },
    };
  } catch (error) {
    await rm(profile, { recursive: true, force: true });
    throw error;
  }
}
