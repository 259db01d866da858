// The command line's side of the fit checks: wording and exit status (documented in
// fringekit --help: 3 = converged but doubtful, --accept-doubtful gives 0), saturated tables,
// implausible units and the meaning of amplitude in `fringekit models`. Data simulated with
// NumPy (Debian python3-numpy), formulas written out below; skips visibly without it.
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { python, scipyMissing } from "../stats/python.js";
import { runInProcess } from "./runCli.js";

const maybe = scipyMissing ? it.skip : it;
const work = mkdtempSync(join(tmpdir(), "fringekit-checks-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

let beam = "", clipped = "";
beforeAll(() => {
  if (scipyMissing) return;
  const files = python<{ beam: string; clipped: string }>(`
import numpy as np
x = (np.arange(2048) - 1024) * 5.5e-6
rng = np.random.default_rng(21)
beam = rng.poisson(30.0 + 1500.0 * np.exp(-2 * (x / 2.5e-3) ** 2))     # Gaussian beam, no fringes
s = x / np.sqrt(x * x + 1.0)
line = 100.0 + 7000.0 * np.sinc(0.1e-3 * s / 632.8e-9) ** 2 * (1 + 0.8 * np.cos(2 * np.pi * 0.5e-3 * s / 632.8e-9))
clip = np.minimum(rng.poisson(line), 4095)                               # 12-bit top code
table = lambda y: "position [mm],intensity (counts)\\n" + "\\n".join(f"{xi * 1e3:.4f},{v}" for xi, v in zip(x, y))
print(json.dumps({"beam": table(beam), "clipped": table(clip)}))
`, {});
  beam = join(work, "beam.csv");
  clipped = join(work, "clipped.csv");
  writeFileSync(beam, files.beam);
  writeFileSync(clipped, files.clipped);
});

describe("fringekit fit: doubtful fits", () => {
  maybe("fringekit fit beam.csv (no fringes) prints NO beside 'fringe detected', exits 3; --accept-doubtful exits 0", async () => {
    const run = await runInProcess(["fit", beam, "--fix", "wavelength=632.8nm", "--fix", "distance=1m"]);
    expect(run.code).toBe(3);
    expect(run.stdout).toMatch(/converged\s+yes \(.*\), BUT .*NO SIGNIFICANT FRINGE.*: see the warnings/);
    expect(run.stdout).toMatch(/fringe detected\s+NO: period/);
    expect(run.stdout).toMatch(/Warning \(no-fringes\): no significant fringe in these data/);
    expect(run.stderr).toMatch(/^fringekit fit: .*beam\.csv: converged, but no significant fringe in these data .*; the result was still written; exit status 3 \(give --accept-doubtful to exit with 0 on such fits\)\n$/);
    const accepted = await runInProcess(["fit", beam, "--fix", "wavelength=632.8nm", "--fix", "distance=1m", "--accept-doubtful", "--json"]);
    expect(accepted.code).toBe(0);
    expect(JSON.parse(accepted.stdout).goodness.fringes.significant).toBe(false);
  }, 60_000);

  maybe("fringekit fit beam.csv --model single-slit: a poor fit says 'the model does not describe these data' and exits 3", async () => {
    const run = await runInProcess(["fit", beam, "--model", "single-slit", "--fix", "wavelength=632.8nm", "--fix", "distance=1m"]);
    // A Gaussian beam is not a sinc² pattern: Pearson χ² far above ν (Poisson counts).
    expect(run.code).toBe(3);
    expect(run.stdout).toMatch(/goodness of fit\s+POOR: the model does not describe these data \(χ²\/ν = /);
    expect(run.stdout).not.toMatch(/converged\s+yes \([^)]*\)\s*$/m);
    expect(run.stderr).toMatch(/converged, but the model does not describe these data \(χ²\/ν = /);
  }, 60_000);
});

describe("fringekit fit: saturated tables and units", () => {
  maybe("fringekit fit clipped.csv masks the samples at 4095 by default; --keep-saturated keeps them", async () => {
    const masked = JSON.parse((await runInProcess(["fit", clipped, "--fix", "wavelength=632.8nm", "--fix", "distance=1m", "--json"])).stdout);
    const warning = masked.warnings.find((w: { code: string }) => w.code === "saturated-masked");
    expect(warning.message).toMatch(/^\d+ saturated samples \(at the detector top code 4095\) masked at x = /);
    // Truths of the simulation above: visibility 0.8 and separation 0.5 mm, each within 4
    // standard uncertainties; the fit is neither poor nor fringe-less.
    expect(Math.abs(masked.params.visibility.value - 0.8)).toBeLessThan(4 * masked.params.visibility.uncertainty);
    expect(Math.abs(masked.params.separation.value - 0.5e-3)).toBeLessThan(4 * masked.params.separation.uncertainty);
    expect(masked.warnings.map((w: { code: string }) => w.code)).not.toContain("poor-fit");
    expect(masked.warnings.map((w: { code: string }) => w.code)).not.toContain("no-fringes");
    const kept = await runInProcess(["fit", clipped, "--fix", "wavelength=632.8nm", "--fix", "distance=1m", "--json", "--keep-saturated"]);
    expect(JSON.parse(kept.stdout).warnings.map((w: { code: string }) => w.code)).toContain("saturated-kept");
    expect((await runInProcess(["fit", clipped, "--mask-saturated", "--keep-saturated"])).code).toBe(2);
  }, 60_000);

  it("fringekit fit FILE --fix wavelength=532 is refused with the likely unit named (exit 2)", async () => {
    const file = join(work, "tiny.csv");
    writeFileSync(file, "position [mm],intensity (counts)\n" + Array.from({ length: 40 }, (_, i) => `${(i * 0.01).toFixed(2)},${100 + (i % 5)}`).join("\n"));
    const run = await runInProcess(["fit", file, "--fix", "wavelength=532"]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/invalid fix\.wavelength: 532 \(532 m is not a plausible wavelength .*532 looks like nanometres: write "532 nm"\)/);
  });

  it("fringekit models says what amplitude means in every model", async () => {
    const { stdout } = await runInProcess(["models"]);
    expect(stdout).toMatch(/amplitude means the same in every model: the peak above background of the fully coherent pattern/);
    expect(stdout).toMatch(/^two-slit-broadband-wavelength/m);
  });
});
