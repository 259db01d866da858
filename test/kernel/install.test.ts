// installKernelspec writes a kernelspec that Debian's jupyter_client finds
// (`JUPYTER_PATH=PREFIX/share/jupyter jupyter kernelspec list`).
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { missingPrerequisite, python, repoRoot } from "./helpers.js";

const missing = missingPrerequisite(["jupyter_client"]);
if (missing) console.warn(`kernelspec install tests skipped: ${missing}`);
const dirs: string[] = [];
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

async function installModule() {
  return (await import(pathToFileURL(path.join(repoRoot, "dist", "kernel-ext", "install.js")).href)) as typeof import("../../kernel-ext/install.js");
}

describe.skipIf(missing !== undefined)("installKernelspec({prefix})", () => {
  it("installKernelspec({prefix}) is listed by jupyter_client with an absolute node path", async () => {
    const { installKernelspec } = await installModule();
    const prefix = mkdtempSync(path.join(tmpdir(), "fringekit-spec-"));
    dirs.push(prefix);
    const { directory } = await installKernelspec({ prefix });
    expect(directory).toBe(path.join(prefix, "share", "jupyter", "kernels", "fringekit"));
    // Discovery by jupyter_client's KernelSpecManager, the code behind `jupyter kernelspec list`.
    const probe = spawnSync(python, ["-c", "import json; from jupyter_client.kernelspec import KernelSpecManager as K; print(json.dumps(K().get_all_specs()))"], {
      env: { ...process.env, JUPYTER_PATH: path.join(prefix, "share", "jupyter") },
      encoding: "utf8",
    });
    expect(probe.status, probe.stderr).toBe(0);
    const specs = JSON.parse(probe.stdout.trim().split("\n").pop()!);
    const spec = specs.fringekit?.spec;
    expect(spec, probe.stdout).toBeDefined();
    expect(spec.display_name).toBe("TypeScript (fringekit)");
    expect(spec.language).toBe("typescript");
    expect(spec.interrupt_mode).toBe("signal");
    expect(path.isAbsolute(spec.argv[0])).toBe(true);
    expect(spec.argv[0]).toBe(process.execPath);
    expect(existsSync(spec.argv[1])).toBe(true);
    expect(spec.argv[2]).toBe("{connection_file}");
    expect(readdirSync(directory)).toEqual(["kernel.json"]); // no temporary file left behind
  });

  it("installKernelspec({prefix}) twice replaces the spec", async () => {
    const { installKernelspec } = await installModule();
    const prefix = mkdtempSync(path.join(tmpdir(), "fringekit-spec-"));
    dirs.push(prefix);
    await installKernelspec({ prefix });
    const again = await installKernelspec({ prefix });
    expect(readdirSync(again.directory)).toEqual(["kernel.json"]);
  });
});

describe("installKernelspec options", () => {
  it("installKernelspec({user: true, prefix}) throws InvalidArgumentError", async () => {
    const { installKernelspec } = await import("../../kernel-ext/install.js");
    await expect(installKernelspec({ user: true, prefix: "/somewhere" })).rejects.toThrow(/give either user or prefix/);
  });
  it("installKernelspec({prefix: \"\"}) throws naming the prefix", async () => {
    const { installKernelspec } = await import("../../kernel-ext/install.js");
    await expect(installKernelspec({ prefix: " " })).rejects.toThrow(/invalid prefix/);
  });
  it("kernelSpecFor(relative path) throws", async () => {
    const { kernelSpecFor } = await import("../../kernel-ext/install.js");
    expect(() => kernelSpecFor("node")).toThrow(/invalid nodePath: "node"/);
  });
  it("userKernelsDir({JUPYTER_DATA_DIR}) uses it (jupyter_core's rule)", async () => {
    const { userKernelsDir } = await import("../../kernel-ext/install.js");
    expect(userKernelsDir({ JUPYTER_DATA_DIR: "/data/jupyter" })).toBe(path.join("/data/jupyter", "kernels"));
  });
});
