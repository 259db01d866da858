/**
 * Headless Debian Chromium for figure export, driven by playwright-core in a fresh temporary
 * profile that is removed on close. Never downloads a browser. FRINGEKIT_CHROMIUM may name
 * another Chromium executable.
 */
import { mkdtemp, rm } from "node:fs/promises";
import { createRequire } from "node:module";
import os from "node:os";
import path from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { FringekitError } from "../../src/errors.js";

/** Debian's Chromium (package `chromium`). */
export const DEFAULT_CHROMIUM = "/usr/bin/chromium";

const ARGS = [
  "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
  "--disable-background-networking", "--disable-component-update", "--disable-sync",
  "--font-render-hinting=none",
];

/** A page with plotly.js loaded, and the means to close everything it holds. */
export interface PlotlyPage {
  page: Page;
  context: BrowserContext;
  close(): Promise<void>;
}

/** Path of the plotly.js bundle shipped by the npm package plotly.js-dist-min. */
export function plotlyBundlePath(): string {
  return createRequire(import.meta.url).resolve("plotly.js-dist-min");
}

/**
 * Start Chromium headless and open a blank page with plotly.js loaded from the local bundle
 * (no network). The caller must call close(), also on failure.
 */
export async function openPlotlyPage(): Promise<PlotlyPage> {
  const executablePath = process.env.FRINGEKIT_CHROMIUM || DEFAULT_CHROMIUM;
  const profile = await mkdtemp(path.join(os.tmpdir(), "fringekit-figure-"));
  let context: BrowserContext;
  try {
    context = await chromium.launchPersistentContext(profile, { executablePath, headless: true, args: ARGS, offline: true });
  } catch (error) {
    await rm(profile, { recursive: true, force: true });
    throw new FringekitError(
      "no-browser",
      `figure export needs Chromium at ${executablePath} (${(error as Error).message.split("\n")[0]}); install Debian's chromium package or set FRINGEKIT_CHROMIUM`,
    );
  }
  const close = async () => {
    await context.close().catch(() => undefined);
    await rm(profile, { recursive: true, force: true });
  };
  try {
    const page = context.pages()[0] ?? (await context.newPage());
    await page.setContent('<!doctype html><html><head><meta charset="utf-8"></head><body style="margin:0;background:#fff"><div id="figure"></div></body></html>');
    await page.addScriptTag({ path: plotlyBundlePath() });
    return { page, context, close };
  } catch (error) {
    await close();
    throw error;
  }
}
