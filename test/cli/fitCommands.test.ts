import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getModel, pixelPositions, simulateProfile } from "../../src/advanced.js";
import { runCli, runInProcess } from "./runCli.js";

// B1-like camera line (../shared/bench/PROBLEMS.md) with fewer pixels; the truth is what the
// data were simulated from (common practice for checking a fit on seeded synthetic data).
const TRUTH = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, wavelength: 632.8e-9, distance: 1 };
const work = mkdtempSync(join(tmpdir(), "fringekit-fit-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

function writeLine(name: string, seed: number): string {
  const model = getModel("two-slit");
  const x = pixelPositions(2048, 5.5e-6);
  const data = simulateProfile(model, TRUTH, x, { noise: "poisson", seed });
  const rows = Array.from(data.x, (xi, i) => `${(xi * 1e3).toFixed(6)},${data.y[i]}`);
  const path = join(work, name);
  writeFileSync(path, `# simulated camera line (seed ${seed})\nposition [mm],intensity (counts)\n${rows.join("\n")}\n`);
  return path;
}

// Exit codes are the documented contract of the command (fringekit --help): 0 success, 1 a fit
// did not converge, 2 bad input or usage. Counts (points, rows, files) are those of the inputs made here.
let line: string;
beforeAll(() => {
  line = writeLine("line.csv", 11);
});

describe("fringekit fit FILE", () => {
  it("fringekit fit line.csv --json prints the documented object with SI values near the truth", async () => {
    const { code, stdout } = await runInProcess(["fit", line, "--json"]);
    expect(code).toBe(0);
    const json = JSON.parse(stdout);
    // The one JSON shape of a fit (src/report/results/fitJson) plus where the data came from.
    expect(Object.keys(json)).toEqual(["modelId", "noise", "converged", "reason", "message", "iterations", "params", "statistics", "warnings", "goodness", "provenance"]);
    // Poisson counts: the χ² test runs; simulated from the model itself, so χ²/ν ≈ 1 (Pearson 1900).
    expect(json.goodness).toMatchObject({ test: "pearson-chi2", verdict: "good" });
    expect(json.goodness.fringes.significant).toBe(true);
    expect(Object.keys(json.statistics)).toEqual(["n", "nFree", "dof", "chi2", "reducedChi2", "objective", "logLikelihood", "aic", "aicc", "bic"]);
    expect(json.modelId).toBe("two-slit");
    expect(json.converged).toBe(true);
    expect(Object.keys(json.params.separation)).toEqual(["value", "uncertainty", "unit", "fixed", "atBound"]);
    for (const name of ["separation", "width", "visibility", "center"] as const) {
      const p = json.params[name];
      expect(Math.abs(p.value - TRUTH[name]) / p.uncertainty, name).toBeLessThan(4);
    }
    expect(json.params.wavelength).toMatchObject({ value: 632.8e-9, uncertainty: 0, unit: "m", fixed: true });
    expect(json.statistics.n).toBe(2048);
    expect(json.provenance.source).toBe("line.csv");
    expect(json.provenance.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it("fringekit fit --json and the results file --out res.json hold the fit in one shape (the file adds what replay needs)", async () => {
    const out = join(work, "one-shape.json");
    const { code, stdout } = await runInProcess(["fit", line, "--json", "--out", out]);
    expect(code).toBe(0);
    const printed = JSON.parse(stdout);
    const recorded = JSON.parse(readFileSync(out, "utf8")).fits[0].result;
    for (const key of ["modelId", "noise", "converged", "reason", "message", "iterations", "statistics", "goodness"]) expect(recorded[key], key).toEqual(printed[key]);
    expect(Object.keys(recorded.params)).toEqual(Object.keys(printed.params));
    for (const [name, p] of Object.entries(printed.params as Record<string, Record<string, unknown>>)) {
      expect(recorded.params[name], name).toMatchObject(p);
      expect(Object.keys(recorded.params[name]), name).toEqual([...Object.keys(p), "tied", "lower", "upper"]);
    }
    // JSON has no infinity: an unbounded parameter's bound is tagged as everywhere in results files.
    expect(recorded.params.separation.upper).toEqual({ nonFinite: "Infinity" });
  });

  it("fringekit fit line.csv --set wavelength=632.8 nm --fix visibility=0.85 uses units with or without a space", async () => {
    const { code, stdout } = await runInProcess(["fit", line, "--set", "wavelength=632.8 nm", "--set", "separation=0.49mm", "--fix", "visibility=0.85", "--json"]);
    expect(code).toBe(0);
    const json = JSON.parse(stdout);
    expect(json.params.visibility).toMatchObject({ value: 0.85, fixed: true });
    expect(json.params.wavelength.value).toBeCloseTo(632.8e-9, 20);
  });

  it("fringekit fit line.csv (text) prints value ± uncertainty with units", async () => {
    const { code, stdout } = await runInProcess(["fit", line]);
    expect(code).toBe(0);
    expect(stdout).toMatch(/separation d\s+\(\d+\.\d+ ± \d+\.\d+\) µm/);
  });

  it("fringekit fit line.csv says which geometry was taken from model defaults (default-geometry), and stops once it is given", async () => {
    const text = await runInProcess(["fit", line]);
    expect(text.stdout).toMatch(/Warning \(default-geometry, wavelength\): wavelength not given: the model default 632\.8 nm was used/);
    expect(text.stdout).toMatch(/Warning \(default-geometry, distance\): distance not given: the model default 1 m was used/);
    const json = JSON.parse((await runInProcess(["fit", line, "--json", "--fix", "distance=1m"])).stdout);
    expect(json.warnings.filter((w: { code: string }) => w.code === "default-geometry").map((w: { parameter: string }) => w.parameter)).toEqual(["wavelength"]);
    const given = await runInProcess(["fit", line, "--set", "wavelength=632.8nm", "--fix", "distance=1m"]);
    expect(given.stdout).not.toMatch(/default-geometry/);
  });

  it("fringekit fit with a bad --set is a usage error naming the parameter", async () => {
    const unknown = await runInProcess(["fit", line, "--set", "colour=3"]);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/model "two-slit" has no parameter "colour"/);
    const badUnit = await runInProcess(["fit", line, "--set", "wavelength=3kg"]);
    expect(badUnit.code).toBe(2);
    expect(badUnit.stderr).toMatch(/invalid --set wavelength: "3kg" \(the unit "kg" is not a length unit/);
  });

  it("fringekit fit --out res.json then fringekit replay res.json reproduces; changed data are refused", async () => {
    const copy = join(work, "replay.csv");
    writeFileSync(copy, readFileSync(line));
    const results = join(work, "res.json");
    expect((await runInProcess(["fit", copy, "--out", results])).code).toBe(0);
    const replay = await runInProcess(["replay", results]);
    expect(replay.code).toBe(0);
    expect(replay.stdout).toMatch(/^Reproduced: 1 fit \(two-slit\)/);
    writeFileSync(copy, readFileSync(copy, "utf8").replace(/\n(-?[\d.]+),(\d+)\n/, (_, x, y) => `\n${x},${Number(y) + 1}\n`));
    const changed = await runInProcess(["replay", results]);
    expect(changed.code).toBe(2);
    expect(changed.stderr).toMatch(/does not match .* recorded for replay\.csv/);
  });
});

describe("fringekit fit FILE --figure / fringekit kernel install", () => {
  it("fringekit fit line.csv --figure fit.svg writes an SVG figure (no browser)", async () => {
    const figure = join(work, "fit.svg");
    const { code } = await runInProcess(["fit", line, "--figure", figure]);
    expect(code).toBe(0);
    const svg = readFileSync(figure, "utf8");
    expect(svg).toMatch(/^<svg|<svg /);
    expect(svg).toContain("two-slit");
  });

  it("fringekit fit --figure with a bad extension is refused before fitting", async () => {
    const { code, stderr } = await runInProcess(["fit", line, "--figure", join(work, "fit.gif")]);
    expect(code).toBe(2);
    expect(stderr).toMatch(/invalid --figure: ".*fit\.gif" \(a file name ending in \.svg, \.pdf or \.png\)/);
  });

  it("fringekit kernel install --prefix DIR writes the fringekit kernelspec", () => {
    const prefix = join(work, "prefix");
    const { code, stdout } = runCli(["kernel", "install", "--prefix", prefix]);
    expect(code).toBe(0);
    expect(stdout).toMatch(/installed the Jupyter kernel "fringekit" in .*share\/jupyter\/kernels\/fringekit/);
    const spec = JSON.parse(readFileSync(join(prefix, "share/jupyter/kernels/fringekit/kernel.json"), "utf8"));
    expect(spec.display_name).toContain("fringekit");
  });
});

describe("fringekit compare FILE --models", () => {
  it("fringekit compare line.csv --models two-slit,single-slit --json ranks two-slit first; the single slit's poor fit gives exit 3", async () => {
    const { code, stdout, stderr } = await runInProcess(["compare", line, "--models", "two-slit,single-slit", "--json"]);
    // A single slit cannot describe a two-slit pattern: its χ² test fails (documented exit 3).
    expect(code).toBe(3);
    expect(stderr).toMatch(/every fit converged, but single-slit: the model does not describe these data \(χ²\/ν = /);
    expect((await runInProcess(["compare", line, "--models", "two-slit,single-slit", "--json", "--accept-doubtful"])).code).toBe(0);
    const json = JSON.parse(stdout);
    expect(json.preferred).toBe("two-slit");
    expect(Object.keys(json.ranking[0])).toEqual(expect.arrayContaining(["modelId", "aic", "bic", "deltaAic", "weight", "residualsStructured"]));
    expect(json.ranking.map((r: { modelId: string }) => r.modelId)).toEqual(["two-slit", "single-slit"]);
    expect(typeof json.verdict).toBe("string");
  });
});

describe("fringekit fit/compare/batch --max-evaluations N: a fit that does not converge exits 1 and still writes", () => {
  // Two model evaluations cannot take a seven-parameter fit from its automatic start to the
  // optimum (the solver needs one evaluation per step and at least several steps; common practice).
  it("fringekit fit line.csv --max-evaluations 2 --json --out res.json exits 1, says why, and writes the result", async () => {
    const out = join(work, "stuck.json");
    const { code, stdout, stderr } = await runInProcess(["fit", line, "--max-evaluations", "2", "--json", "--out", out]);
    expect(code).toBe(1);
    expect(stderr).toMatch(/^fringekit fit: .*line\.csv: the fit did not converge \(stopped after \d+ model evaluations without converging; raise --max-evaluations/);
    expect(stderr.trim().split("\n")).toHaveLength(1);
    const json = JSON.parse(stdout);
    expect(json).toMatchObject({ converged: false, reason: "max-evaluations" });
    expect(JSON.parse(readFileSync(out, "utf8")).fits[0].result.converged).toBe(false);
  });

  it("fringekit compare line.csv --max-evaluations 2 exits 1 with no ranking, and writes the results file", async () => {
    const out = join(work, "stuck-compare.json");
    const { code, stdout, stderr } = await runInProcess(["compare", line, "--models", "two-slit,single-slit", "--max-evaluations", "2", "--out", out]);
    expect(code).toBe(1);
    expect(stdout).toMatch(/^No model converged, so none is preferred: two-slit and single-slit stopped after/);
    expect(stderr).toMatch(/^fringekit compare: .*not every fit converged/);
    expect(JSON.parse(readFileSync(out, "utf8")).fits).toHaveLength(2);
  });

  it("fringekit batch line.csv --max-evaluations 2 --jobs 1 marks the row not-converged and exits 1", async () => {
    const out = join(work, "stuck.csv");
    const { code, stderr } = await runInProcess(["batch", line, "--max-evaluations", "2", "--jobs", "1", "--out", out]);
    expect(code).toBe(1);
    expect(stderr).toMatch(/1 file: 0 fitted, 1 did not converge, 0 could not be read or fitted/);
    expect(readFileSync(out, "utf8").split("\n")[1]).toMatch(/line\.csv,not-converged,stopped after \d+ model evaluations without converging; raise --max-evaluations/);
  });

  it("fringekit fit --max-evaluations 0 is a usage error", async () => {
    const { code, stderr } = await runInProcess(["fit", line, "--max-evaluations", "0"]);
    expect(code).toBe(2);
    expect(stderr).toMatch(/invalid --max-evaluations: "0" \(a whole number of model evaluations from 1/);
  });
});

describe("fringekit batch FILES --out", () => {
  it("fringekit batch FOLDER --jobs 1 fits the data files in it, sorted by name; a folder without data files is refused", async () => {
    const folder = join(work, "scan");
    mkdirSync(folder);
    writeFileSync(join(folder, "b.csv"), readFileSync(line));
    writeFileSync(join(folder, "a.csv"), readFileSync(line));
    writeFileSync(join(folder, "notes.json"), "{}");
    writeFileSync(join(folder, ".hidden.csv"), "not data");
    const out = join(work, "folder.csv");
    const { code } = await runInProcess(["batch", folder, "--jobs", "1", "--out", out]);
    expect(code).toBe(0);
    const files = readFileSync(out, "utf8").trim().split("\n").slice(1).map((r) => r.split(",")[0]);
    expect(files).toEqual([join(folder, "a.csv"), join(folder, "b.csv")]);
    const empty = join(work, "empty");
    mkdirSync(empty);
    const refused = await runInProcess(["batch", empty, "--out", join(work, "none.csv")]);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/empty: a folder with no data files \(\.csv, .*\); give the data files or the folder that holds them/);
  });

  it("fringekit batch 3 good files + 1 bad --jobs 2 writes one row per file and does not stop", () => {
    const files = [writeLine("b1.csv", 21), writeLine("b2.csv", 22), join(work, "bad.csv"), writeLine("b3.csv", 23)];
    writeFileSync(files[2]!, "position [mm],intensity\n0.1,1\n0.1,2\n0.2,3\n");
    const out = join(work, "results.csv");
    const { code, stderr } = runCli(["batch", ...files, "--jobs", "2", "--out", out]);
    expect(code).toBe(1); // one file could not be fitted; the others are in the results
    expect(stderr).toMatch(/4 files: 3 fitted, 0 did not converge, 1 could not be read or fitted/);
    const rows = readFileSync(out, "utf8").trim().split("\n");
    expect(rows).toHaveLength(5);
    expect(rows[0]).toMatch(/^file,status,message,n,reducedChi2,aic,bic,amplitude,amplitude_uncertainty,/);
    expect(rows[1]).toMatch(/b1\.csv,ok,/);
    expect(rows[3]).toMatch(/bad\.csv,error,.*duplicated position 0\.1/);
    expect(rows[4]).toMatch(/b3\.csv,ok,/);
  });
});
