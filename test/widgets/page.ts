/** Builds the widget bundles plus the test harness page and opens it in headless Chromium. */
import { mkdtemp, rm, writeFile } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { buildWidgetBundles, distDir } from "../../widgets/build.js";
import { launchBrowser, type Browser } from "./browser.js";

const here = path.dirname(fileURLToPath(import.meta.url));

export interface HarnessPage extends Browser {
  /** Page errors seen so far (a test fails when this is not empty). */
  errors: string[];
}

/** Build bundles, write a page that loads the harness, open it; close() cleans everything. */
export async function openHarness(width = 1280, height = 800): Promise<HarnessPage> {
  await buildWidgetBundles([{ entry: path.join(here, "harness/harness.ts"), out: "test-harness.js" }]);
  const dir = await mkdtemp(path.join(os.tmpdir(), "fringekit-widgets-page-"));
  const browser = await launchBrowser(width, height).catch(async (error) => {
    await rm(dir, { recursive: true, force: true });
    throw error;
  });
  const errors: string[] = [];
  browser.page.on("pageerror", (error) => errors.push(error.message));
  const file = path.join(dir, "harness.html");
  const script = pathToFileURL(path.join(distDir, "test-harness.js")).href;
  await writeFile(file, `<!doctype html><html><head><meta charset="utf-8"><title>fringekit widgets</title></head>` +
    `<body style="margin:16px;font-family:sans-serif"><script src="${script}"></script></body></html>`);
  try {
    await browser.page.goto(pathToFileURL(file).href);
    await browser.page.waitForSelector("body[data-ready]", { state: "attached" });
  } catch (error) {
    await browser.close();
    await rm(dir, { recursive: true, force: true });
    throw error;
  }
  return {
    ...browser,
    errors,
    close: async () => {
      await browser.close();
      await rm(dir, { recursive: true, force: true });
    },
  };
}
