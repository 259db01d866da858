// How the command starts (issue 14, benchmark B9): `npm run build` bundles the command line into
// dist/cli/bundle/ (scripts/bundle-command.ts); bin/fringekit.js runs it when it is fresh and
// falls back to dist/cli/main.js when it is missing, stale or damaged, and for batch and kernel.
// Timing lives in bench/B9.ts; these tests check that the fast path gives the same results.
import { spawnSync } from "node:child_process";
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, utimesSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { ROOT, runCli } from "./runCli.js";

const DATA = join(ROOT, "notebooks-demo/data");
const BUNDLE = join(ROOT, "dist/cli/bundle/run.js");
const work = mkdtempSync(join(tmpdir(), "fringekit-start-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function node(args: string[], cwd = ROOT): { code: number; stdout: string; stderr: string } {
  const result = spawnSync(process.execPath, args, { cwd, encoding: "utf8", timeout: 120_000 });
  if (result.error) throw result.error;
  return { code: result.status ?? -1, stdout: result.stdout, stderr: result.stderr };
}

function needBundle(): void {
  if (!existsSync(BUNDLE)) throw new Error("dist/cli/bundle/run.js is missing: run `npm run build` (it bundles the command) before these tests");
}

describe("the bundled command gives what dist/cli/main.js gives", () => {
  it.each([
    ["fit line-pair-A.csv --json", ["fit", join(DATA, "line-pair-A.csv"), "--json"]],
    ["fit frame-pair-C.png --pixel-pitch 5.5 um --dark dark-pair-C.png --json", ["fit", join(DATA, "frame-pair-C.png"), "--pixel-pitch", "5.5", "um", "--dark", join(DATA, "dark-pair-C.png"), "--json"]],
    ["compare line-pair-A.csv --models two-slit,n-slit", ["compare", join(DATA, "line-pair-A.csv"), "--models", "two-slit,n-slit"]],
    ["models --json", ["models", "--json"]],
    ["fit missing.csv (error line)", ["fit", join(work, "missing.csv")]],
  ])("fringekit %s: same stdout, stderr and exit code", (_name, args) => {
    needBundle();
    // The reference is the tsc output run directly, module by module (no bundle involved).
    const reference = node([join(ROOT, "dist/cli/main.js"), ...args]);
    const bundled = runCli(args);
    expect(bundled).toEqual(reference);
    expect(reference.stdout.length + reference.stderr.length).toBeGreaterThan(0);
  });

  it("fringekit fit good.csv records the file's SHA-256 as Python's hashlib computes it", () => {
    const file = join(ROOT, "test/io/corpus/good.csv");
    const python = spawnSync("/usr/bin/python3", ["-c", "import hashlib,sys; print(hashlib.sha256(open(sys.argv[1],'rb').read()).hexdigest())", file], { encoding: "utf8" });
    if (python.status !== 0) {
      console.warn("SKIPPED: /usr/bin/python3 not available for the hashlib comparison");
      return;
    }
    const { stdout } = runCli(["fit", file, "--json"]);
    expect(JSON.parse(stdout).provenance.sha256).toBe(python.stdout.trim());
  });
});

describe("fringekit fit loads the image decoders only for an image", () => {
  // A module hook (node:module register) prints every module Node loads; the decoders are the
  // npm packages fast-png (PNG), fflate (inflate) and utif2 (TIFF).
  const hooks = join(work, "list-modules.mjs");
  writeFileSync(hooks, `import { register } from "node:module";
register("data:text/javascript," + encodeURIComponent(\`export async function load(url, context, next) { process.stderr.write("LOADED " + url + "\\\\n"); return next(url, context); }\`));
`);
  const decoders = (stderr: string): string[] => [...new Set(stderr.split("\n").filter((l) => l.startsWith("LOADED ")).map((l) => /\/node_modules\/(fast-png|fflate|utif2)\//.exec(l)?.[1]).filter((p): p is string => p !== undefined))].sort();

  it("fringekit fit line-pair-A.csv loads none of fast-png, fflate, utif2", () => {
    needBundle();
    const run = node(["--import", hooks, join(ROOT, "bin/fringekit.js"), "fit", join(DATA, "line-pair-A.csv"), "--json"]);
    expect(run.code).toBe(0);
    expect(run.stderr).toContain("LOADED ");
    expect(decoders(run.stderr)).toEqual([]);
  });

  it("fringekit fit frame-pair-C.png loads them", () => {
    needBundle();
    const run = node(["--import", hooks, join(ROOT, "bin/fringekit.js"), "fit", join(DATA, "frame-pair-C.png"), "--pixel-pitch", "5.5", "um", "--json"]);
    expect(run.stdout).toContain('"modelId"');
    expect(decoders(run.stderr)).toEqual(["fast-png", "fflate", "utif2"]);
  });
});

describe("fringekit batch: a row awaits the decoders, answers stay in input order", () => {
  it("fringekit batch frame.png line.csv frame.png --jobs 2 writes the rows --jobs 1 writes", () => {
    const inputs = [join(DATA, "frame-pair-C.png"), join(DATA, "line-pair-A.csv"), join(DATA, "frame-pair-C.png")];
    const one = runCli(["batch", ...inputs, "--pixel-pitch", "5.5", "um", "--jobs", "1", "--out", join(work, "one.csv")]);
    const two = runCli(["batch", ...inputs, "--pixel-pitch", "5.5", "um", "--jobs", "2", "--out", join(work, "two.csv")]);
    expect([one.code, two.code]).toEqual([0, 0]);
    const rows = readFileSync(join(work, "two.csv"), "utf8");
    expect(rows).toBe(readFileSync(join(work, "one.csv"), "utf8"));
    expect(rows.trim().split("\n").slice(1).map((r) => r.split(",")[1])).toEqual(["ok", "ok", "ok"]);
  });
});

describe("bin/fringekit.js falls back to dist/cli/main.js", () => {
  // A copy of the package whose dist/ links to the built one, with a bundle folder of our own.
  function packageCopy(name: string): { root: string; bundle: string } {
    const root = join(work, name);
    mkdirSync(join(root, "bin"), { recursive: true });
    copyFileSync(join(ROOT, "bin/fringekit.js"), join(root, "bin/fringekit.js"));
    copyFileSync(join(ROOT, "package.json"), join(root, "package.json"));
    symlinkSync(join(ROOT, "node_modules"), join(root, "node_modules"));
    mkdirSync(join(root, "dist/cli"), { recursive: true });
    for (const folder of readdirSync(join(ROOT, "dist"))) if (folder !== "cli") symlinkSync(join(ROOT, "dist", folder), join(root, "dist", folder));
    for (const entry of readdirSync(join(ROOT, "dist/cli"))) if (entry !== "bundle") symlinkSync(join(ROOT, "dist/cli", entry), join(root, "dist/cli", entry));
    return { root, bundle: join(root, "dist/cli/bundle") };
  }
  /** A stand-in bundle whose run() only says that it ran. */
  const FAKE = 'export async function run() { process.stdout.write("bundle ran\\n"); return 0; }\n';
  const fringekit = (root: string, args: string[]) => node([join(root, "bin/fringekit.js"), ...args], root);

  it("without dist/cli/bundle: fringekit fit line-pair-A.csv --json runs from dist/cli/main.js", () => {
    const { root } = packageCopy("no-bundle");
    const run = fringekit(root, ["fit", join(DATA, "line-pair-A.csv"), "--json"]);
    expect(run).toEqual(node([join(ROOT, "dist/cli/main.js"), "fit", join(DATA, "line-pair-A.csv"), "--json"]));
    expect(run.code).toBe(0);
  });

  it("a fresh bundle runs; a stale one (older than dist/cli/main.js) is ignored", () => {
    const { root, bundle } = packageCopy("stale-bundle");
    mkdirSync(bundle);
    writeFileSync(join(bundle, "run.js"), FAKE);
    expect(fringekit(root, ["--version"]).stdout).toBe("bundle ran\n");
    utimesSync(join(bundle, "run.js"), new Date("2000-01-01"), new Date("2000-01-01"));
    const run = fringekit(root, ["--version"]);
    expect(run.stdout).toBe("fringekit 0.1.0\n");
  });

  it("fringekit batch and fringekit kernel never run from the bundle", () => {
    const { root, bundle } = packageCopy("unbundled-commands");
    mkdirSync(bundle);
    writeFileSync(join(bundle, "run.js"), FAKE);
    const batch = fringekit(root, ["batch", "a.csv"]);
    expect(batch.stdout).not.toContain("bundle ran");
    expect(batch.stderr).toMatch(/batch needs --out/);
    const kernel = fringekit(root, ["kernel", "--help"]);
    expect(kernel.stdout).not.toContain("bundle ran");
    expect(kernel.stdout).toMatch(/fringekit kernel install/);
  });

  it.each([
    ["a syntax error", "export async function run( {\n"],
    ["a missing chunk", 'import "./chunk-GONE.js";\nexport async function run() { return 0; }\n'],
    ["a throwing module", 'throw new Error("damaged");\n'],
  ])("a bundle with %s is skipped: the command still runs, once", (name, source) => {
    const { root, bundle } = packageCopy(`damaged-${name.replace(/\W+/g, "-")}`);
    mkdirSync(bundle);
    writeFileSync(join(bundle, "run.js"), source);
    const run = fringekit(root, ["fit", join(DATA, "line-pair-A.csv")]);
    expect(run.code).toBe(0);
    expect(run.stderr).toBe("");
    expect(run.stdout).toBe(node([join(ROOT, "dist/cli/main.js"), "fit", join(DATA, "line-pair-A.csv")]).stdout);
    expect(readFileSync(join(bundle, "run.js"), "utf8")).toBe(source);
  });
});
