// NIST StRD nonlinear regression suite: every dataset in ../shared/reference/nist-strd, both
// starting points, model taken from the file's own model line and compiled as a formula string.
// Score: log relative error (LRE, correct significant digits) against the certified values
// (NIST/ITL Statistical Reference Datasets, nonlinear regression; LRE as defined in McCullough,
// "Assessing the reliability of statistical software", The American Statistician 52 (1998) 358).
// `npm run nist` prints the table; the last line is the summary others rely on.
import { spawnSync } from "node:child_process";
import { readdirSync, readFileSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { compileFormula, type CompiledFormula } from "../src/fit/formula.js";
import { leastSquares, type LeastSquaresProblem } from "../src/fit/leastSquares.js";
import { normalPseudoInverse } from "../src/fit/linalg.js";

/** Folder of the NIST files, relative to this file: <repo>/../shared/reference/nist-strd. */
export const NIST_DIR = join(dirname(fileURLToPath(import.meta.url)), "..", "..", "shared", "reference", "nist-strd");

export interface NistDataset {
  name: string;
  /** Formula in mathjs syntax, translated from the file's model line. */
  formula: string;
  /** Response transform from the left-hand side ("y" or "log(y)"). */
  response: "y" | "log(y)";
  predictors: string[];
  parameters: string[];
  starts: [number[], number[]];
  certified: number[];
  certifiedSd: number[];
  certifiedRss: number;
  dof: number;
  y: Float64Array;
  /** One column per predictor. */
  columns: Float64Array[];
}

/** Parses one StRD file as published (model line, starts, certified values, data block). */
export function parseNistFile(path: string): NistDataset {
  const lines = readFileSync(path, "utf8").split(/\r?\n/);
  const name = basename(path, ".dat");
  const modelStart = lines.findIndex((l) => /^Model:/.test(l));
  const startHeader = lines.findIndex((l, i) => i > modelStart && /Starting\s+values/i.test(l));
  if (modelStart < 0 || startHeader < 0) throw new Error(`${name}: no model block`);
  // Statements: lines with "=", continuation lines appended; skip the class/parameter-count lines.
  const statements: string[] = [];
  for (const raw of lines.slice(modelStart + 1, startHeader)) {
    const line = raw.trim();
    if (line === "" || /Parameters? \(/.test(line) || /Class/.test(line)) continue;
    if (line.includes("=") && !/^[+\-*/]/.test(line) && !(statements.length > 0 && /[/*+-]$/.test(statements[statements.length - 1]))) statements.push(line);
    else statements[statements.length - 1] += " " + line;
  }
  const constants = new Map<string, string>();
  let lhs = "", rhs = "";
  for (const statement of statements) {
    const [left, right] = statement.split("=").map((s) => s.trim());
    if (/^[A-Za-z]+$/.test(left) && /^[-+0-9.Ee]+$/.test(right)) constants.set(left, right);
    else { lhs = left; rhs = right; }
  }
  let formula = rhs.replace(/\+\s*e\s*$/, "").replace(/\*\*/g, "^").replace(/\[/g, "(").replace(/\]/g, ")").replace(/\barctan\b/g, "atan");
  for (const [constant, value] of constants) formula = formula.replace(new RegExp(`\\b${constant}\\b`, "g"), `(${value})`);
  const response = lhs.replace(/\s/g, "") === "log[y]" ? "log(y)" : "y";
  const parameters: string[] = [], start1: number[] = [], start2: number[] = [], certified: number[] = [], certifiedSd: number[] = [];
  for (const line of lines.slice(startHeader)) {
    const m = /^\s*(b\d+)\s*=\s*(\S+)\s+(\S+)\s+(\S+)\s+(\S+)\s*$/.exec(line);
    if (!m) continue;
    parameters.push(m[1]); start1.push(Number(m[2])); start2.push(Number(m[3])); certified.push(Number(m[4])); certifiedSd.push(Number(m[5]));
  }
  const rssLine = lines.find((l) => /Residual Sum of Squares:/.test(l));
  const dofLine = lines.find((l) => /Degrees of Freedom:/.test(l));
  const dataHeader = lines.findIndex((l) => /^\s*Data:\s+y\s/.test(l));
  if (!rssLine || !dofLine || dataHeader < 0) throw new Error(`${name}: missing certified values or data block`);
  const names = lines[dataHeader].replace(/^\s*Data:/, "").trim().split(/\s+/);
  const predictors = names.slice(1);
  const rows = lines.slice(dataHeader + 1).map((l) => l.trim()).filter((l) => l !== "").map((l) => l.split(/\s+/).map(Number));
  const y = Float64Array.from(rows, (r) => (response === "log(y)" ? Math.log(r[0]) : r[0]));
  const columns = predictors.map((_, k) => Float64Array.from(rows, (r) => r[k + 1]));
  return {
    name, formula, response, predictors, parameters, starts: [start1, start2], certified, certifiedSd,
    certifiedRss: Number(rssLine.split(":")[1]), dof: y.length - parameters.length, y, columns,
  };
}

/** Log relative error (correct digits), capped at 11 (the certified values carry 11 digits). */
export function lre(estimate: number, certified: number): number {
  if (!Number.isFinite(estimate)) return 0;
  if (estimate === certified) return 11;
  const relative = certified === 0 ? Math.abs(estimate) : Math.abs(estimate - certified) / Math.abs(certified);
  return Math.max(0, Math.min(11, -Math.log10(relative)));
}

export interface NistOutcome {
  name: string;
  start: 1 | 2;
  parameterDigits: number[];
  sdDigits: number[];
  rssDigits: number;
  evaluations: number;
  reason: string;
}

/** Fits one dataset from one start with the formula's symbolic Jacobian. */
export function fitNist(data: NistDataset, start: 1 | 2): NistOutcome {
  const formula = compileFormula(data.formula, { vectors: data.predictors, scalars: data.parameters });
  const p = data.parameters.length, n = data.y.length;
  const derivatives = data.parameters.map((b) => formula.derivative(b));
  const column = new Float64Array(n);
  const problem: LeastSquaresProblem = {
    n, p,
    residuals(params, out) {
      formula.evaluate(data.columns, params, out);
      for (let i = 0; i < n; i++) out[i] = data.y[i] - out[i];
    },
  };
  if (derivatives.every((d) => d !== null)) {
    const ds = derivatives as CompiledFormula[];
    problem.jacobian = (params, jac) => {
      for (let j = 0; j < p; j++) {
        ds[j].evaluate(data.columns, params, column);
        for (let i = 0; i < n; i++) jac[i * p + j] = -column[i];
      }
    };
  }
  const outcome = leastSquares(problem, Float64Array.from(data.starts[start - 1]), {
    ftol: 1e-15, xtol: 1e-15, gtol: 1e-15, maxEvaluations: 20000,
  });
  const { inverse } = normalPseudoInverse(outcome.jacobian, n, p);
  const s2 = outcome.cost / data.dof;
  return {
    name: data.name, start,
    parameterDigits: data.certified.map((c, j) => lre(outcome.x[j], c)),
    sdDigits: data.certifiedSd.map((c, j) => lre(Math.sqrt(inverse[j * p + j] * s2), c)),
    rssDigits: lre(outcome.cost, data.certifiedRss),
    evaluations: outcome.evaluations,
    reason: outcome.reason,
  };
}

/** Runs all datasets from both starts. */
export function runNistSuite(dir = NIST_DIR): NistOutcome[] {
  const files = readdirSync(dir).filter((f) => f.endsWith(".dat")).sort();
  const outcomes: NistOutcome[] = [];
  for (const file of files) {
    const data = parseNistFile(join(dir, file));
    outcomes.push(fitNist(data, 1), fitNist(data, 2));
  }
  return outcomes;
}

/** The per-dataset digits table (minimum over parameters) as text. */
export function formatNistTable(outcomes: NistOutcome[]): string {
  const rows = ["dataset    start  params  std.dev  RSS    evals  stop reason"];
  for (const o of outcomes) {
    rows.push(`${o.name.padEnd(10)} ${String(o.start).padStart(5)}  ${Math.min(...o.parameterDigits).toFixed(1).padStart(6)}  ${Math.min(...o.sdDigits).toFixed(1).padStart(7)}  ${o.rssDigits.toFixed(1).padStart(4)}  ${String(o.evaluations).padStart(6)}  ${o.reason}`);
  }
  return rows.join("\n");
}

/** Summary line: how many dataset-starts have every parameter to ≥ 6 digits. */
export function nistSummary(outcomes: NistOutcome[]): string {
  const passed = outcomes.filter((o) => Math.min(...o.parameterDigits) >= 6).length;
  return `NIST StRD: ${passed}/${outcomes.length} dataset-starts with every parameter to >= 6 digits`;
}

export function main(): void {
  const started = performance.now();
  const outcomes = runNistSuite();
  process.stdout.write(`${formatNistTable(outcomes)}\n`);
  const sdOk = outcomes.filter((o) => Math.min(...o.sdDigits) >= 4).length;
  const rssOk = outcomes.filter((o) => o.rssDigits >= 6).length;
  process.stdout.write(`certified standard deviations to >= 4 digits: ${sdOk}/${outcomes.length}; RSS to >= 6 digits: ${rssOk}/${outcomes.length} (${((performance.now() - started) / 1000).toFixed(1)} s)\n`);
  // The same files through SciPy's MINPACK LM, for comparison (skipped when SciPy is absent).
  const script = join(dirname(fileURLToPath(import.meta.url)), "reference", "nist_scipy.py");
  const scipy = spawnSync("/usr/bin/python3", [script, NIST_DIR], { encoding: "utf8" });
  const scipyLine = scipy.status === 0 ? scipy.stdout.trim().split("\n").pop() : "SciPy NIST StRD: not run (/usr/bin/python3 with python3-scipy not available)";
  process.stdout.write(`${scipyLine}\n`);
  process.stdout.write(`${nistSummary(outcomes)}\n`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main();
