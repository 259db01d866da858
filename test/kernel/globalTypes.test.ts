// Which @types packages enter the kernel's global scope (kernel-ext/tslabPin.ts kernelGlobalTypes):
// through jupyter_client against the installed kernel, in a project folder made here.
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import * as vitest from "vitest";
import { kernelGlobalTypes } from "../../kernel-ext/tslabPin.js";
import { checksSuite } from "./helpers.js";

let project = "";
vitest.afterAll(() => {
  if (project) rmSync(project, { recursive: true, force: true });
});

function writePackage(dir: string, files: Record<string, string>): void {
  mkdirSync(dir, { recursive: true });
  for (const [name, text] of Object.entries(files)) writeFileSync(path.join(dir, name), text);
}

vitest.describe("kernelGlobalTypes(setting)", () => {
  vitest.it("kernelGlobalTypes(undefined) is Node's types only", () => {
    vitest.expect(kernelGlobalTypes(undefined)).toEqual(["node"]);
  });
  vitest.it("kernelGlobalTypes(' mocha, jquery,,node') adds the listed names once", () => {
    vitest.expect(kernelGlobalTypes(" mocha, jquery,,node")).toEqual(["node", "mocha", "jquery"]);
  });
  vitest.it("kernelGlobalTypes('*') leaves TypeScript's default (every @types package)", () => {
    vitest.expect(kernelGlobalTypes("*")).toBeUndefined();
  });
});

await checksSuite(vitest, {
  title: "global types in kernel cells",
  script: "globalTypes.py",
  minimumChecks: 5,
  args: () => {
    project = mkdtempSync(path.join(tmpdir(), "fringekit-types-"));
    const modules = path.join(project, "node_modules");
    writePackage(path.join(modules, "@types", "labglob"), { "package.json": '{"name":"@types/labglob","version":"1.0.0"}', "index.d.ts": "declare var labGlobal: string;\n" });
    writePackage(path.join(modules, "labmod"), { "package.json": '{"name":"labmod","version":"1.0.0","main":"index.js"}', "index.js": "exports.answer = 42;\n" });
    writePackage(path.join(modules, "@types", "labmod"), { "package.json": '{"name":"@types/labmod","version":"1.0.0"}', "index.d.ts": "export declare const answer: number;\n" });
    return [project];
  },
  required: [
    "default: Node's globals type-check",
    "default: globals of an unimported @types package are unknown",
    "default: an imported package gets its @types declarations",
    "FRINGEKIT_KERNEL_TYPES=labglob: its globals type-check",
  ],
});
