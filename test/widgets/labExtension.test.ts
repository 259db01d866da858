// The JupyterLab 4 prebuilt extension: built with @jupyterlab/builder, manifest checked, and
// its federated module loaded into a page that supplies @jupyter-widgets/base as JupyterLab would.
import { mkdtempSync, readFileSync, rmSync, existsSync } from "node:fs";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { installLabExtension } from "../../kernel-ext/widgets/installLab.js";
import { buildLabExtension, buildWidgetBundles, distDir, labExtensionDir } from "../../widgets/build.js";
import { MODULE_NAME, MODULE_VERSION } from "../../widgets/shared/version.js";
import { hasChromium, launchBrowser, type Browser } from "./browser.js";

const here = path.dirname(fileURLToPath(import.meta.url));
const run = hasChromium() ? describe : describe.skip;

run("JupyterLab prebuilt extension", () => {
  let server: Server;
  let browser: Browser;
  let origin = "";
  let manifest: { name: string; jupyterlab: { _build: { load: string; extension: string }; sharedPackages: Record<string, unknown> } };

  beforeAll(async () => {
    await buildLabExtension();
    await buildWidgetBundles([{ entry: path.join(here, "harness/labhost.ts"), out: "test-labhost.js" }]);
    manifest = JSON.parse(readFileSync(path.join(labExtensionDir, "package.json"), "utf8"));
    server = createServer((req, res) => {
      const url = new URL(req.url ?? "/", "http://x");
      if (url.pathname === "/") {
        res.writeHead(200, { "content-type": "text/html" }).end('<!doctype html><meta charset="utf-8"><body><script src="/host.js"></script></body>');
        return;
      }
      const file = url.pathname === "/host.js" ? path.join(distDir, "test-labhost.js") : path.join(labExtensionDir, path.normalize(url.pathname).replace(/^([/\\])+/, ""));
      if (!file.startsWith(distDir) || !existsSync(file)) {
        res.writeHead(404).end();
        return;
      }
      res.writeHead(200, { "content-type": "text/javascript" }).end(readFileSync(file));
    });
    await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
    origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    browser = await launchBrowser();
  }, 900_000);

  afterAll(async () => {
    await browser?.close();
    await new Promise((r) => (server ? server.close(r) : r(undefined)));
  });

  it("the manifest names the module, its remote entry and @jupyter-widgets/base as a shared singleton", () => {
    expect(manifest.name).toBe(MODULE_NAME);
    expect(manifest.jupyterlab._build.extension).toBe("./extension");
    expect(existsSync(path.join(labExtensionDir, manifest.jupyterlab._build.load))).toBe(true);
    expect(manifest.jupyterlab.sharedPackages["@jupyter-widgets/base"]).toEqual({ bundled: false, singleton: true });
  });

  it("the federated module uses the host's @jupyter-widgets/base and registers working widget classes", async () => {
    const errors: string[] = [];
    browser.page.on("pageerror", (e) => errors.push(e.message));
    await browser.page.goto(origin);
    await browser.page.waitForSelector("body[data-ready]", { state: "attached" });
    const loaded = (await browser.page.evaluate(`labhost.loadExtension(${JSON.stringify(`${origin}/${manifest.jupyterlab._build.load}`)}, ${JSON.stringify(MODULE_NAME)})
      .then((r) => { window.__fkExports = r.exports; return { id: r.id, sameRegistryToken: r.sameRegistryToken, registered: r.registered }; })`)) as
      { id: string; sameRegistryToken: boolean; registered: { name: string; version: string; exports: string[] }[] };
    expect(loaded.sameRegistryToken).toBe(true);
    expect(loaded.registered).toHaveLength(1);
    expect(loaded.registered[0]).toMatchObject({ name: MODULE_NAME, version: MODULE_VERSION });
    expect(loaded.registered[0]!.exports).toEqual(expect.arrayContaining(["ExplorerModel", "ExplorerView", "ComparisonView", "UncertaintyView", "CoherenceScanView"]));
    expect(await browser.page.evaluate(`labhost.renderThrough(window.__fkExports, ${JSON.stringify(MODULE_NAME)}, ${JSON.stringify(MODULE_VERSION)})`)).toBe(true);
    expect(errors).toEqual([]);
  });

  it("installLabExtension({prefix}) puts it under share/jupyter/labextensions/<name>", async () => {
    const prefix = mkdtempSync(path.join(os.tmpdir(), "fringekit-lab-"));
    try {
      const dir = await installLabExtension({ prefix });
      expect(dir).toBe(path.join(prefix, "share", "jupyter", "labextensions", MODULE_NAME));
      expect(existsSync(path.join(dir, manifest.jupyterlab._build.load))).toBe(true);
      await installLabExtension({ prefix }); // a second install replaces the first
      expect(existsSync(path.join(dir, "package.json"))).toBe(true);
    } finally {
      rmSync(prefix, { recursive: true, force: true });
    }
  });
});
