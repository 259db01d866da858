// The tslab pin check: the exact tslab 1.0.22 loads; any other version or changed file fails loudly.
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { loadTslab, TslabPinError, TSLAB_VERSION } from "../../kernel-ext/tslabPin.js";

const require = createRequire(import.meta.url);
const tslabRoot = path.dirname(require.resolve("tslab/package.json"));
const dirs: string[] = [];
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

/** A project whose node_modules/tslab is a copy of the installed one, altered by `change`. */
function fakeProject(change: (tslabDir: string) => void): string {
  const dir = mkdtempSync(path.join(tmpdir(), "fringekit-pin-"));
  dirs.push(dir);
  const copy = path.join(dir, "node_modules", "tslab");
  cpSync(path.join(tslabRoot, "dist"), path.join(copy, "dist"), { recursive: true });
  cpSync(path.join(tslabRoot, "package.json"), path.join(copy, "package.json"));
  change(copy);
  return pathToFileURL(path.join(dir, "index.js")).href;
}

describe("loadTslab()", () => {
  it("loadTslab() accepts the installed tslab 1.0.22 and exposes its internals", () => {
    const tslab = loadTslab();
    expect(tslab.version).toBe(TSLAB_VERSION);
    expect(typeof tslab.main.startKernel).toBe("function");
    expect(typeof tslab.jupyter.ZmqServer.prototype.handleShellMessage).toBe("function");
  });

  it("loadTslab(url) rejects another tslab version", () => {
    const url = fakeProject((dir) => {
      const pkg = JSON.parse(readFileSync(path.join(dir, "package.json"), "utf8"));
      writeFileSync(path.join(dir, "package.json"), JSON.stringify({ ...pkg, version: "1.0.23" }));
    });
    expect(() => loadTslab(url)).toThrow(TslabPinError);
    expect(() => loadTslab(url)).toThrow(/found tslab 1\.0\.23, need exactly 1\.0\.22/);
  });

  it("loadTslab(url) rejects a changed dist/jupyter.js even with the right version", () => {
    const url = fakeProject((dir) => {
      const file = path.join(dir, "dist", "jupyter.js");
      writeFileSync(file, readFileSync(file, "utf8").replace("handleShellMessage", "handleShellMsg"));
    });
    expect(() => loadTslab(url)).toThrow(/dist\/jupyter\.js differs from the released 1\.0\.22/);
  });

  it("loadTslab(url) without tslab says it is not installed", () => {
    const dir = mkdtempSync(path.join(tmpdir(), "fringekit-pin-"));
    dirs.push(dir);
    expect(() => loadTslab(pathToFileURL(path.join(dir, "index.js")).href)).toThrow(/tslab is not installed/);
  });
});
