import { closeSync, mkdtempSync, openSync, readFileSync, readdirSync, rmSync, truncateSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { ROOT, runCli, runInProcess } from "./runCli.js";

const corpus = (name: string): string => join(ROOT, "test/io/corpus", name);
const work = mkdtempSync(join(tmpdir(), "fringekit-cli-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** A one-line error: no stack trace, names the file. */
function expectOneLineError(stderr: string, file: string): void {
  const lines = stderr.trim().split("\n");
  expect(lines).toHaveLength(1);
  expect(lines[0]).toContain(file);
  expect(stderr).not.toMatch(/\n\s+at /);
}

// Exit codes are the documented contract of the command (fringekit --help): 0 success, 1 a fit
// did not converge, 2 bad input or usage.
describe("fringekit --help / models", () => {
  it("fringekit --help prints the usage with every command and the laser-safety caution", () => {
    const { code, stdout } = runCli(["--help"]);
    expect(code).toBe(0);
    for (const command of ["models", "fit FILE", "compare FILE", "profile FRAME", "batch FILES", "kernel install", "replay RESULT.json"]) expect(stdout).toContain(`fringekit ${command}`);
    expect(stdout).toMatch(/laser safety officer/);
  });

  it("fringekit models --json lists the required models with name, unit, default, bounds and meaning", async () => {
    const { code, stdout } = await runInProcess(["models", "--json"]);
    expect(code).toBe(0);
    const models = JSON.parse(stdout) as { id: string; parameters: Record<string, unknown>[] }[];
    const ids = models.map((m) => m.id);
    for (const id of ["two-slit", "n-slit", "single-slit", "two-slit-fresnel", "two-slit-broadband", "coherence-disc", "coherence-gaussian"]) expect(ids).toContain(id);
    const disc = models.find((m) => m.id === "coherence-disc")!;
    expect(disc.parameters.map((p) => p["name"])).toEqual(expect.arrayContaining(["diameter", "sourceDistance", "wavelength"]));
    for (const p of models[0]!.parameters) expect(Object.keys(p)).toEqual(expect.arrayContaining(["name", "unit", "default", "lower", "upper", "description"]));
  });

  it("fringekit models (text) shows a parameter table per model", async () => {
    const { code, stdout } = await runInProcess(["models"]);
    expect(code).toBe(0);
    expect(stdout).toMatch(/^two-slit/m);
    expect(stdout).toMatch(/separation\s+m\s/);
  });
});

describe("fringekit usage errors exit 2 with one line", () => {
  it.each([
    [["nonsense"], /unknown command "nonsense"/],
    [["fit", "a.csv", "--bogus"], /unknown option --bogus for "fringekit fit"/],
    [["fit"], /fit needs exactly one data file/],
    [["fit", "a.csv", "--noise"], /option --noise needs a value/],
    [["compare", "a.csv", "--models", "two-slit"], /compare needs at least two models/],
    [["batch", "a.csv"], /batch needs --out results\.csv or --out results\.json/],
    [["profile", "f.png", "--roi", "1,2,3"], /invalid --roi: "1,2,3"/],
  ])("fringekit %j", async (args, message) => {
    const { code, stderr } = await runInProcess(args as string[]);
    expect(code).toBe(2);
    expect(stderr.trim().split("\n")).toHaveLength(1);
    expect(stderr).toMatch(message as RegExp);
  });
});

describe("fringekit fit BAD-FILE exits 2, names the file and writes nothing", () => {
  it.each(["empty.csv", "header-only.csv", "non-numeric.csv", "nan.csv", "duplicate.csv", "non-monotonic.csv", "wrong-unit.csv", "truncated.png", "corrupt.png", "palette.png", "truncated.tif", "signed.tif", "binary.dat"])(
    "fringekit fit %s --out result.json",
    async (name) => {
      const before = readFileSync(corpus(name));
      const out = join(work, `${name}.json`);
      // One case runs the built command as a child process; the rest run in this process.
      const args = ["fit", corpus(name), "--pixel-pitch", "5.5", "um", "--out", out];
      const { code, stderr, stdout } = name === "truncated.png" ? runCli(args) : await runInProcess(args);
      expect(code).toBe(2);
      expect(stdout).toBe("");
      expectOneLineError(stderr, name);
      expect(readdirSync(work).filter((f) => f.startsWith(name))).toEqual([]);
      expect(readFileSync(corpus(name))).toEqual(before);
    },
  );

  it("fringekit fit refuses a file above the size limit before reading it", () => {
    const huge = join(work, "huge.csv");
    // A sparse 70 MiB file: above the 64 MiB table limit, no memory used.
    closeSync(openSync(huge, "w"));
    truncateSync(huge, 70 * 1024 * 1024);
    const { code, stderr } = runCli(["fit", huge]);
    expect(code).toBe(2);
    expect(stderr).toMatch(/huge\.csv: the file is 70 MiB, above the 64 MiB limit for text tables; split it/);
    rmSync(huge);
  });
});

describe("fringekit profile FRAME", () => {
  it("fringekit profile good16.png --pixel-pitch 5.5 um --out p.csv writes a table the fit command reads", () => {
    const out = join(work, "p.csv");
    const { code, stdout } = runCli(["profile", corpus("good16.png"), "--pixel-pitch", "5.5", "um", "--out", out]);
    expect(code).toBe(0);
    expect(stdout).toBe("");
    const text = readFileSync(out, "utf8");
    expect(text).toMatch(/^# profile of good16\.png \(sha256 [0-9a-f]{64}\)/);
    expect(text).toContain("\n# pixel pitch 5.5 µm (--pixel-pitch)\n");
    expect(text).toContain("position [mm],intensity,sigma\n0,1739,");
    expect(text).toContain("\n0.0055,1306,"); // 1 pixel × 5.5 µm = 0.0055 mm; 1306 = round(1000 + 800 cos(2π·(−14.5)/8)) from the scene
  });

  it("fringekit profile refuses to write over its input", async () => {
    const copy = join(work, "frame.png");
    writeFileSync(copy, readFileSync(corpus("good16.png")));
    const { code, stderr } = await runInProcess(["profile", copy, "--out", copy]);
    expect(code).toBe(2);
    expect(stderr).toMatch(/the output file is one of the input files/);
    expect(readFileSync(copy)).toEqual(readFileSync(corpus("good16.png")));
  });
});
