// B9 of ../shared/bench/PROBLEMS.md: command start. `fringekit --help` and one B1 fit from a
// CSV file (`fringekit fit`), each a fresh process, against `python3 -c "import scipy.optimize"`
// and a SciPy script fitting the same file (bench/reference/fit_csv_scipy.py), interleaved in
// the same run, medians of 5. fringekit fits with its default noise model for counts (Poisson);
// SciPy with least_squares(method="lm") and σ = √max(y, 1), as in B1.
// `npm run bench -- B9 --baseline DIR` also times the command of another fringekit folder (an
// older build, with its bin/, dist/ and package.json), interleaved in the same rounds.
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { b1Profile, PYTHON } from "./B1.js";

const HERE = dirname(fileURLToPath(import.meta.url));
const ROOT = dirname(HERE);
const ROUNDS = 5;

function timed(command: string, args: string[]): number {
  const t0 = performance.now();
  const run = spawnSync(command, args, { encoding: "utf8", cwd: ROOT });
  const seconds = (performance.now() - t0) / 1000;
  if (run.status !== 0) throw new Error(`${command} ${args.join(" ")} failed (exit ${run.status}): ${run.stderr}`);
  return seconds;
}

/** The folder after --baseline, if given (its bin/fringekit.js is timed too). */
function baselineRoot(): string | undefined {
  const at = process.argv.indexOf("--baseline");
  if (at < 0) return undefined;
  const root = process.argv[at + 1];
  if (!root || !existsSync(join(root, "bin", "fringekit.js"))) throw new Error("--baseline needs a fringekit folder with bin/fringekit.js (e.g. a copy of an older build)");
  return root;
}

const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)]!;
const load = () => loadavg().map((v) => v.toFixed(2)).join(" ");

export async function main(): Promise<void> {
  const bin = join(ROOT, "bin", "fringekit.js");
  if (!existsSync(join(ROOT, "dist/cli/main.js"))) throw new Error("B9 needs the built command: run `npm run build` first");
  if (spawnSync(PYTHON, ["-c", "import scipy.optimize"], { stdio: "ignore" }).status !== 0) throw new Error("B9 needs Debian's python3-scipy");
  const work = mkdtempSync(join(tmpdir(), "fringekit-b9-"));
  try {
    const profile = b1Profile(1);
    const csvFk = join(work, "line.csv");
    const csvPy = join(work, "line-si.csv");
    writeFileSync(csvFk, `position [mm],intensity (counts)\n${Array.from(profile.x, (x, i) => `${x * 1e3},${profile.y[i]}`).join("\n")}\n`);
    writeFileSync(csvPy, `position_m,counts\n${Array.from(profile.x, (x, i) => `${x},${profile.y[i]}`).join("\n")}\n`);
    const baseline = baselineRoot();
    const baseBin = baseline ? join(baseline, "bin", "fringekit.js") : undefined;
    const fitWords = [
      "fit", csvFk, "--model", "two-slit", "--fix", "wavelength=632.8nm", "--fix", "distance=1m", "--fix", "pixelWidth=5.5um",
      "--set", "amplitude=18000", "--set", "background=100", "--set", "center=0.30mm", "--set", "separation=0.497mm",
      "--set", "width=0.110mm", "--set", "visibility=0.70", "--set", "phase=0", "--json",
    ];
    const fitArgs = [bin, ...fitWords];
    const t = { fkHelp: [] as number[], pyHelp: [] as number[], fkFit: [] as number[], pyFit: [] as number[], baseHelp: [] as number[], baseFit: [] as number[] };
    for (let round = 0; round < ROUNDS; round++) {
      t.fkHelp.push(timed(process.execPath, [bin, "--help"]));
      t.pyHelp.push(timed(PYTHON, ["-c", "import scipy.optimize"]));
      t.fkFit.push(timed(process.execPath, fitArgs));
      t.pyFit.push(timed(PYTHON, [join(HERE, "reference", "fit_csv_scipy.py"), csvPy]));
      if (baseBin) {
        t.baseHelp.push(timed(process.execPath, [baseBin, "--help"]));
        t.baseFit.push(timed(process.execPath, [baseBin, ...fitWords]));
      }
      const base = baseBin ? `; baseline help ${t.baseHelp[round]!.toFixed(2)} s, fit ${t.baseFit[round]!.toFixed(2)} s` : "";
      process.stdout.write(`B9 round ${round + 1}: help ${t.fkHelp[round]!.toFixed(2)} s vs ${t.pyHelp[round]!.toFixed(2)} s, fit ${t.fkFit[round]!.toFixed(2)} s vs ${t.pyFit[round]!.toFixed(2)} s${base} (loadavg ${load()})\n`);
    }
    const [fh, ph, ff, pf] = [median(t.fkHelp), median(t.pyHelp), median(t.fkFit), median(t.pyFit)];
    process.stdout.write(`B9 load average ${load()}; medians of ${ROUNDS}; fringekit help ${fh.toFixed(2)} s, fit ${ff.toFixed(2)} s; python import ${ph.toFixed(2)} s, SciPy fit ${pf.toFixed(2)} s\n`);
    if (baseBin) {
      const [bh, bf] = [median(t.baseHelp), median(t.baseFit)];
      process.stdout.write(`B9 baseline ${baseline}: help ${bh.toFixed(2)} s, fit ${bf.toFixed(2)} s; ratio ${((bh + bf) / (ph + pf)).toFixed(2)} (help ${(bh / ph).toFixed(2)}, fit ${(bf / pf).toFixed(2)})\n`);
    }
    process.stdout.write(`B9 command start ratio ${((fh + ff) / (ph + pf)).toFixed(2)} (help ${(fh / ph).toFixed(2)}, fit ${(ff / pf).toFixed(2)})\n`);
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}
