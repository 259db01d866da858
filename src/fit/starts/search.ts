/**
 * The global stage of a fit: the local solver (bounded Levenberg–Marquardt) is run from several
 * candidate starts, best-ranked first, and the search stops once it knows it is done:
 *   - the best converged optimum has been reached from two starts ("confirmed"), and
 *   - when the noise scale is known (Poisson, or σ absolute), its objective is also within
 *     3 standard deviations of its expectation (ν + 3√(2ν), χ² statistics): a wrong fringe order
 *     or phase branch leaves a far larger objective, so a poor optimum keeps the search going.
 * Otherwise every candidate is tried. When no other candidate reached the best optimum, one more
 * start tests it: the winning start mirrored through the optimum (θ* + (θ* − θ0)), each free
 * parameter displaced by at least 2 % of its magnitude (0.3 rad for a phase; 1 % of the position
 * span for a position near 0), so the basin must reach at least as far on the other side.
 * "Same optimum" is defined in {@link sameOptimum}.
 */
import type { SolverOutcome } from "../leastSquares.js";
import { solvePrepared, startVector, type PreparedFit } from "../preparedFit.js";
import { STOP_REASONS } from "../status.js";
import type { FitWarning, StartsSummary } from "../types.js";

/**
 * Standard deviations of χ²(ν) above ν below which a confirmed optimum ends the search. At 5 a
 * near-field fit with the slit width in the wrong basin (χ² 4.3σ above ν on 3866 points of low
 * counts) was accepted; above 3 a right fit is rare (0.13 %) and only costs the remaining starts.
 */
const ACCEPTABLE_SIGMAS = 3;

/** One solver run of the global stage. */
export interface StartRun {
  /** Free parameters at the start (solver order). */
  start: Float64Array;
  /** Free parameters at the end of the run (solver order). */
  theta: Float64Array;
  /** Minimised objective (see FitStatistics.objective). */
  cost: number;
  converged: boolean;
}

/** What the global stage found: the best outcome and every run. */
export interface SearchResult {
  best: SolverOutcome;
  runs: StartRun[];
}

/** True when the noise scale is known, so the objective can be judged against χ²(ν). */
export function knownNoiseScale(prep: PreparedFit): boolean {
  return prep.noise.id === "poisson" || (prep.noise.id === "gaussian" && prep.sigmaAbsolute && prep.noise.sigmaSource !== "unknown");
}

/**
 * Largest objective difference counted as the same optimum: 1e-3 of one unit of reduced χ²
 * (1 when the noise scale is known, else the best objective / ν) plus 1e-6 of the objective.
 * A difference of 1 in χ² is one standard deviation of a single parameter, so 1e-3 is far below
 * anything a user could see, yet far above the solver's stopping tolerance.
 */
export function objectiveTolerance(prep: PreparedFit, bestCost: number): number {
  const dof = Math.max(1, prep.x.length - prep.plan.free.length);
  const unit = knownNoiseScale(prep) ? 1 : Math.max(bestCost / dof, 1e-300);
  return 1e-3 * unit + 1e-6 * Math.abs(bestCost);
}

/**
 * Runs the solver from each candidate until the best optimum is confirmed (see module comment).
 * @param confirm false: stop at the first converged acceptable optimum (known noise scale) without confirmation
 */
export function searchStarts(prep: PreparedFit, candidates: Record<string, number>[], confirm = true): SearchResult {
  let best: SolverOutcome | null = null;
  const runs: StartRun[] = [];
  const dof = prep.x.length - prep.plan.free.length;
  const known = knownNoiseScale(prep);
  const seen: Float64Array[] = [];
  let mirrored: SolverOutcome | null = null;
  const isConverged = (o: SolverOutcome): boolean => STOP_REASONS[o.reason].converged;
  /** Runs the solver from θ0 and keeps the better outcome; false when cancelled. */
  const run = (theta0: Float64Array): boolean => {
    const outcome = solvePrepared(prep, theta0);
    if (outcome.reason === "cancelled") { best = outcome; return false; }
    const converged = isConverged(outcome);
    runs.push({ start: theta0, theta: Float64Array.from(outcome.x), cost: outcome.cost, converged });
    const better = best === null
      || (converged && !isConverged(best))
      || (converged === isConverged(best) && outcome.cost < best.cost);
    if (better) best = outcome;
    return true;
  };
  const confirmed = (): boolean => {
    const tol = objectiveTolerance(prep, best!.cost);
    return runs.filter((r) => r.converged && Math.abs(r.cost - best!.cost) <= tol).length >= 2;
  };
  /** Tries the mirrored start once per best optimum; true when the best is then confirmed. */
  const mirror = (): boolean => {
    if (mirrored === best) return confirmed();
    mirrored = best;
    const winner = runs.find((r) => r.converged && r.cost === best!.cost);
    if (!winner) return false;
    if (!run(mirroredStart(prep, winner.start, best!.x))) return true;
    if (best !== mirrored) mirrored = null; // the mirror run found a better optimum: it needs its own test
    return confirmed();
  };
  for (const candidate of candidates.length > 0 ? candidates : [{}]) {
    const theta0 = startVector(prep, candidate);
    // The same start twice would confirm nothing.
    if (seen.some((u) => u.every((v, k) => Math.abs(v - theta0[k]) <= 1e-9 * Math.max(Math.abs(v), 1e-300)))) continue;
    seen.push(theta0);
    if (!run(theta0)) return { best: best!, runs };
    if (!isConverged(best!)) continue;
    const acceptable = !known || best!.cost <= dof + ACCEPTABLE_SIGMAS * Math.sqrt(2 * Math.max(dof, 1));
    if (!acceptable) continue;
    if (!confirm) {
      if (known) break;
      continue;
    }
    if (confirmed() || mirror()) return { best: best!, runs };
    if (best!.reason === "cancelled") return { best: best!, runs };
  }
  if (confirm && isConverged(best!) && !confirmed()) mirror();
  return { best: best!, runs };
}

/** The confirmation start of the module comment, clipped into the bounds. */
function mirroredStart(prep: PreparedFit, start: Float64Array, optimum: Float64Array): Float64Array {
  const span = prep.x.length > 1 ? Math.abs(prep.x[prep.x.length - 1] - prep.x[0]) : 1;
  return Float64Array.from(optimum, (value, k) => {
    const j = prep.plan.free[k];
    const name = prep.plan.names[j];
    const spec = prep.model.parameters[j];
    let minimum = 0.02 * Math.abs(value);
    if (name === "phase") minimum = 0.3;
    else if (spec.unit === "m" && minimum < 0.01 * span && name === "center") minimum = 0.01 * span;
    if (!(minimum > 0)) minimum = 0.02 * Math.max(Math.abs(spec.default), 1e-12);
    let step = value - start[k];
    if (Math.abs(step) < minimum) step = step < 0 ? -minimum : minimum;
    return Math.min(prep.plan.upper[k], Math.max(prep.plan.lower[k], value + step));
  });
}

/**
 * True when run `a` ended at the same optimum as the best fit: objectives within
 * {@link objectiveTolerance} and every free parameter within 0.1 standard uncertainty
 * (phase compared modulo 2π; parameters with no finite uncertainty compared by objective only).
 * @param uncertainty standard uncertainty of each free parameter (solver order, SI)
 */
export function sameOptimum(prep: PreparedFit, run: StartRun, best: StartRun, uncertainty: readonly number[]): boolean {
  if (!run.converged || Math.abs(run.cost - best.cost) > objectiveTolerance(prep, best.cost)) return false;
  return prep.plan.free.every((j, k) => {
    let diff = run.theta[k] - best.theta[k];
    if (prep.plan.names[j] === "phase") diff -= 2 * Math.PI * Math.round(diff / (2 * Math.PI));
    const u = uncertainty[k];
    if (!(u > 0) || !Number.isFinite(u)) return true;
    return Math.abs(diff) <= 0.1 * u;
  });
}

/**
 * The `result.starts` summary and, when the best optimum was reached from one start only while
 * others were tried, the "starts-disagree" warning.
 */
export function summarizeStarts(prep: PreparedFit, search: SearchResult, uncertainty: readonly number[], method: string): { starts: StartsSummary; warning: FitWarning | null } {
  const { runs, best } = search;
  const bestRun: StartRun = { start: Float64Array.from(best.x), theta: Float64Array.from(best.x), cost: best.cost, converged: STOP_REASONS[best.reason].converged };
  const converged = runs.filter((r) => r.converged).length;
  const agreeing = bestRun.converged ? runs.filter((r) => sameOptimum(prep, r, bestRun, uncertainty)).length : 0;
  const starts: StartsSummary = { tried: runs.length, converged, agreeing, method };
  let warning: FitWarning | null = null;
  if (runs.length >= 2 && bestRun.converged && agreeing < 2) {
    const others = runs.filter((r) => r.converged && !sameOptimum(prep, r, bestRun, uncertainty)).map((r) => r.cost - best.cost);
    const gap = others.length > 0 ? `; the other converged starts ended ${others.map((d) => d.toPrecision(3)).join(", ")} higher in the objective` : "";
    warning = {
      code: "starts-disagree",
      message: `the best optimum was reached from only 1 of ${runs.length} starts (${converged} converged${gap}): it is not confirmed to be the global one; give starting values near the expected answer and compare`,
    };
  }
  return { starts, warning };
}
