// Batch rows say when a converged fit is doubtful (issue 12: a bad fit is loud on every surface):
// status "doubtful" with the check's words in the message column, and the command's exit status
// 3 as `fringekit fit` (documented in --help), 0 with --accept-doubtful. Data simulated with
// NumPy (Debian python3-numpy), formulas written out below; skips visibly without it.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { python, scipyMissing } from "../stats/python.js";
import { runInProcess } from "./runCli.js";

const maybe = scipyMissing ? it.skip : it;
const work = mkdtempSync(join(tmpdir(), "fringekit-batch-doubtful-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

let beam = "", line = "";
beforeAll(() => {
  if (scipyMissing) return;
  const files = python<{ beam: string; line: string }>(`
import numpy as np
x = (np.arange(2048) - 1024) * 5.5e-6
rng = np.random.default_rng(33)
beam = rng.poisson(30.0 + 1500.0 * np.exp(-2 * (x / 2.5e-3) ** 2))     # Gaussian beam, no fringes
s = x / np.sqrt(x * x + 1.0)                                           # sin(theta) at L = 1 m
# two slits, separation 0.5 mm, width 0.1 mm, V = 0.8, 632.8 nm (Born & Wolf 8.5 / 7.3)
fr = rng.poisson(100.0 + 4000.0 * np.sinc(0.1e-3 * s / 632.8e-9) ** 2 * (1 + 0.8 * np.cos(2 * np.pi * 0.5e-3 * s / 632.8e-9)) / 2)
table = lambda y: "position [mm],intensity (counts)\\n" + "\\n".join(f"{xi * 1e3:.4f},{v}" for xi, v in zip(x, y))
print(json.dumps({"beam": table(beam), "line": table(fr)}))
`, {});
  beam = join(work, "beam.csv");
  line = join(work, "line.csv");
  writeFileSync(beam, files.beam);
  writeFileSync(line, files.line);
});

describe("fringekit batch: doubtful rows", () => {
  maybe("fringekit batch line.csv beam.csv --jobs 1: the fringe-free beam is a 'doubtful' row naming the missing fringe; exit 3; --accept-doubtful exits 0", async () => {
    const out = join(work, "results.csv");
    const geometry = ["--fix", "wavelength=632.8nm", "--fix", "distance=1m", "--jobs", "1", "--quiet"];
    const run = await runInProcess(["batch", line, beam, ...geometry, "--out", out]);
    expect(run.code).toBe(3);
    expect(run.stderr).toMatch(/2 files: 1 fitted, 1 doubtful \(the model does not describe the data, or no fringe; see the message column\), 0 did not converge, 0 could not be read or fitted/);
    const rows = readFileSync(out, "utf8").trim().split("\n");
    expect(rows[1]).toMatch(/line\.csv,ok,/);
    expect(rows[2]).toMatch(/beam\.csv,doubtful,"?no significant fringe in these data/);
    const accepted = await runInProcess(["batch", line, beam, ...geometry, "--accept-doubtful", "--out", join(work, "accepted.csv")]);
    expect(accepted.code).toBe(0);
  }, 180_000);
});
