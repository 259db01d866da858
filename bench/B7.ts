// B7 of ../shared/bench/PROBLEMS.md: paper figure export. B1's data and fringekit fit as the
// paper fit figure (data, model, normalised residual panel, 85 mm wide) written as SVG, PDF and
// 600 dpi PNG by a fresh process (node bench/figureExport.mjs, using the built dist/), against
// a matplotlib script doing the same from a fresh Python (bench/reference/fit_figure_matplotlib.py),
// interleaved in the same run, medians of 5 each. Both read the same CSV of data and fit.
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, statSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { b1Profile, fitB1, PYTHON } from "./B1.js";

const HERE = dirname(fileURLToPath(import.meta.url));
const ROOT = dirname(HERE);
const ROUNDS = 9;

/** GNU time (Debian package "time") reports the child's CPU time, which the machine's load disturbs far less than wall time. */
const GNU_TIME = "/usr/bin/time";

function timed(command: string, args: string[]): { wall: number; cpu: number } {
  const withCpu = existsSync(GNU_TIME);
  const t0 = performance.now();
  const run = withCpu
    ? spawnSync(GNU_TIME, ["-f", "B7CPU %U %S", command, ...args], { encoding: "utf8", cwd: ROOT })
    : spawnSync(command, args, { encoding: "utf8", cwd: ROOT });
  const wall = (performance.now() - t0) / 1000;
  if (run.status !== 0) throw new Error(`${command} ${args.join(" ")} failed: ${run.stderr}`);
  const m = /B7CPU ([\d.]+) ([\d.]+)/.exec(run.stderr ?? "");
  return { wall, cpu: m ? Number(m[1]) + Number(m[2]) : NaN };
}

const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)]!;
const load = () => loadavg().map((v) => v.toFixed(2)).join(" ");

export async function main(): Promise<void> {
  if (!existsSync(join(ROOT, "dist/kernel-ext/figures/saveFigure.js"))) throw new Error("B7 needs the built package: run `npm run build` first");
  if (spawnSync(PYTHON, ["-c", "import matplotlib, numpy"], { stdio: "ignore" }).status !== 0) {
    throw new Error("B7 needs Debian's python3-matplotlib (apt-get install python3-matplotlib)");
  }
  const work = mkdtempSync(join(tmpdir(), "fringekit-b7-"));
  try {
    const profile = b1Profile(1);
    const result = fitB1(profile, "poisson");
    if (!result.converged) throw new Error("B1 fit did not converge");
    const lines = ["x,y,model,residual"];
    for (let i = 0; i < profile.x.length; i++) lines.push(`${profile.x[i]},${profile.y[i]},${result.model[i]},${result.residuals[i]}`);
    const data = join(work, "b1-fit.csv");
    writeFileSync(data, `${lines.join("\n")}\n`);
    const fk: number[] = [], mpl: number[] = [], fkCpu: number[] = [], mplCpu: number[] = [];
    for (let round = 0; round < ROUNDS; round++) {
      // Interleaved A, B so both see the same load.
      const a = timed(process.execPath, [join(HERE, "figureExport.mjs"), data, join(work, "fringekit")]);
      const b = timed(PYTHON, [join(HERE, "reference", "fit_figure_matplotlib.py"), data, join(work, "matplotlib")]);
      fk.push(a.wall); fkCpu.push(a.cpu); mpl.push(b.wall); mplCpu.push(b.cpu);
      process.stdout.write(`B7 round ${round + 1}: fringekit ${a.wall.toFixed(2)} s (CPU ${a.cpu.toFixed(2)} s), matplotlib ${b.wall.toFixed(2)} s (CPU ${b.cpu.toFixed(2)} s) (loadavg ${load()})\n`);
    }
    const sizes = (base: string) => ["svg", "pdf", "png"].map((ext) => `${ext} ${(statSync(join(work, `${base}.${ext}`)).size / 1024).toFixed(0)} KB`).join(", ");
    process.stdout.write(`B7 files: fringekit ${sizes("fringekit")}; matplotlib ${sizes("matplotlib")}\n`);
    const svgKb = statSync(join(work, "fringekit.svg")).size / 1024;
    const a = median(fk), b = median(mpl);
    process.stdout.write(`B7 load average ${load()}; medians of ${ROUNDS}; CPU time ratio ${(median(fkCpu) / median(mplCpu)).toFixed(2)} (fringekit ${median(fkCpu).toFixed(2)} s, matplotlib ${median(mplCpu).toFixed(2)} s)\n`);
    process.stdout.write(`B7 figure export ratio ${(a / b).toFixed(2)} (fringekit ${a.toFixed(2)} s, matplotlib ${b.toFixed(2)} s; svg ${svgKb.toFixed(0)} KB)\n`);
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}
