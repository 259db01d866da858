/**
 * Bounded Levenberg–Marquardt for problems written as residual vectors r(θ) (minimise Σ r²).
 *
 * Method: Levenberg–Marquardt with Moré's diagonal scaling D = running maximum of the Jacobian
 * column norms (Moré 1978, "The Levenberg–Marquardt algorithm: implementation and theory",
 * in Numerical Analysis, Springer LNM 630), the damping update of Nielsen (1999, IMM-REP-1999-05,
 * λ ← λ·max(1/3, 1 − (2ρ − 1)³) on success, λ ← λν, ν ← 2ν on failure) and optional
 * geodesic acceleration (Transtrum & Sethna 2012, arXiv:1201.5885).
 *
 * Bounds by projection with an active set, not by a variable transform: a parameter that sits on
 * a bound with the gradient pushing outward is held for that step, and the trial point is clipped
 * to the box. Why: parameters and Jacobian stay in physical units, so the trust region, the
 * stopping tests and the covariance mean what they say, and an unbounded problem is solved
 * exactly as plain LM would (a sin/sqrt transform distorts all three near a bound).
 *
 * The step is the least-squares solution of [J; √λ·D] δ ≈ [−r; 0], computed as in MINPACK from a
 * Householder QR of J once per Jacobian and a small QR of the 2p × p system [R; √λ·D] per damping
 * value, so the normal equations (and their squared condition number) are never formed. The
 * iteration loop allocates nothing: every buffer lives in the workspace made at the start.
 */
import { applyQt, applyQtColumns, backSubstitute, householderQr, householderQrColumns } from "./linalg.js";
import type { StopReason } from "./types.js";

/** A nonlinear least-squares problem: n residuals in p parameters. */
export interface LeastSquaresProblem {
  readonly n: number;
  readonly p: number;
  /** Writes r(θ) (length n) into `out`. Non-finite values make the solver reject the point. */
  residuals(params: Float64Array, out: Float64Array): void;
  /** Optional analytic Jacobian, row-major n × p: jac[i·p + j] = ∂r_i/∂θ_j. */
  jacobian?(params: Float64Array, jac: Float64Array, out?: Float64Array): void;
  /** True when `jacobian(params, jac, out)` also writes r(θ) into `out` (then a trial point after a
   * good step is evaluated with its Jacobian in one call, saving a model evaluation per iteration). */
  jacobianWritesResiduals?: boolean;
}

/** Progress report, once per iteration. */
export interface SolverProgress {
  iteration: number;
  evaluations: number;
  /** Current Σ r². */
  cost: number;
  /** Current damping parameter λ (dimensionless). */
  damping: number;
}

/** Options of {@link leastSquares}: bounds, limits, tolerances (relative), progress and cancellation. */
export interface SolverOptions {
  /** Lower/upper bounds (same units as θ); ±Infinity where unbounded. */
  lower?: Float64Array;
  upper?: Float64Array;
  /** Limit on residual evaluations (numerical-Jacobian evaluations included). Default 200·(p+1). */
  maxEvaluations?: number;
  /** Stop when actual and predicted relative reduction of Σ r² are both below ftol. Default 1e-12. */
  ftol?: number;
  /** Stop when the scaled step is below xtol times the scaled parameter norm. Default 1e-12. */
  xtol?: number;
  /** Stop when every gradient cosine |Jⱼ·r| / (‖Jⱼ‖‖r‖) is below gtol. Default 1e-12. */
  gtol?: number;
  /** Typical magnitude of each parameter, for numerical differentiation steps. Default max(|θ₀|, 1e-12)… */
  typical?: Float64Array;
  /** Use geodesic acceleration (one extra evaluation per iteration). Default true. */
  geodesic?: boolean;
  /** Initial damping factor relative to max diag(JᵀJ)/D². Default 1e-3. */
  initialDamping?: number;
  onProgress?: (progress: SolverProgress) => void;
  /** Checked once per iteration; when `aborted` is true the solver returns with reason "cancelled". */
  signal?: { readonly aborted: boolean };
}

/** What {@link leastSquares} returns: the optimum, its residuals and Jacobian, and why it stopped. */
export interface SolverOutcome {
  /** Best parameters found (the last accepted point). */
  x: Float64Array;
  /** Residuals at x. */
  residuals: Float64Array;
  /** Jacobian at x, row-major n × p. */
  jacobian: Float64Array;
  /** Σ r² at x. */
  cost: number;
  reason: StopReason;
  iterations: number;
  evaluations: number;
  jacobianEvaluations: number;
  /** True when some Jacobian entries were non-finite and replaced by 0. */
  nonFiniteJacobian: boolean;
  /** Trial points where the residuals were non-finite (those steps were rejected). */
  nonFiniteTrials: number;
}

const EPS = 2.220446049250313e-16;
const CBRT_EPS = Math.cbrt(EPS);

/**
 * Minimise Σ r(θ)² from `start` within [lower, upper] by bounded Levenberg–Marquardt.
 * Never throws for a failing fit: the outcome carries the stop reason.
 * @param start starting parameters (any units; clipped into the bounds)
 */
export function leastSquares(problem: LeastSquaresProblem, start: Float64Array, options: SolverOptions = {}): SolverOutcome {
  const budget = options.maxEvaluations ?? 200 * (problem.p + 1);
  if (options.geodesic === false) return levenbergMarquardt(problem, start, { ...options, maxEvaluations: budget });
  // Geodesic acceleration first with half the budget; when that does not converge (it can stall
  // in valleys whose curvature rule keeps rejecting steps, e.g. NIST MGH10 from start 1), plain LM
  // from the same start gets the rest. The evaluation counts of both runs are reported.
  const first = levenbergMarquardt(problem, start, { ...options, maxEvaluations: Math.ceil(budget / 2) });
  if (first.reason !== "max-evaluations" && first.reason !== "non-finite" && first.reason !== "singular") return first;
  const second = levenbergMarquardt(problem, start, { ...options, geodesic: false, maxEvaluations: budget - first.evaluations });
  second.evaluations += first.evaluations;
  second.jacobianEvaluations += first.jacobianEvaluations;
  second.iterations += first.iterations;
  second.nonFiniteTrials += first.nonFiniteTrials;
  return second.reason === "cancelled" || second.cost <= first.cost || !Number.isFinite(first.cost) ? second : { ...first, evaluations: second.evaluations, jacobianEvaluations: second.jacobianEvaluations, iterations: second.iterations };
}

function levenbergMarquardt(problem: LeastSquaresProblem, start: Float64Array, options: SolverOptions): SolverOutcome {
  const { n, p } = problem;
  const lower = options.lower ?? new Float64Array(p).fill(-Infinity);
  const upper = options.upper ?? new Float64Array(p).fill(Infinity);
  const maxEvaluations = options.maxEvaluations ?? 200 * (p + 1);
  const ftol = options.ftol ?? 1e-12, xtol = options.xtol ?? 1e-12, gtol = options.gtol ?? 1e-12;
  const geodesic = options.geodesic ?? true;

  // Workspace: everything the loop touches.
  const x = new Float64Array(p), xTrial = new Float64Array(p), step = new Float64Array(p);
  const r = new Float64Array(n), rTrial = new Float64Array(n), rWork = new Float64Array(n), rWork2 = new Float64Array(n);
  let jac = new Float64Array(n * p), jacTrial = new Float64Array(problem.jacobianWritesResiduals ? n * p : 0);
  // qr: the Jacobian's QR factors stored column by column (contiguous columns of length n)
  const qr = new Float64Array(n * p), qtr = new Float64Array(n);
  const rdiag = new Float64Array(p), tau = new Float64Array(p);
  const small = new Float64Array(2 * p * p), smallRhs = new Float64Array(2 * p), smallDiag = new Float64Array(p), smallTau = new Float64Array(p);
  const grad = new Float64Array(p), colNorm = new Float64Array(p), diag = new Float64Array(p), accel = new Float64Array(p), rStep = new Float64Array(p);
  const held = new Uint8Array(p);
  const typical = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    x[j] = Math.min(upper[j], Math.max(lower[j], start[j]));
    typical[j] = options.typical?.[j] ?? Math.max(Math.abs(start[j]), 1e-12);
  }

  let evaluations = 0, jacobianEvaluations = 0, iterations = 0;
  let nonFiniteJacobian = false, nonFiniteTrials = 0;
  const evaluate = (params: Float64Array, out: Float64Array): number => {
    evaluations++;
    problem.residuals(params, out);
    let s = 0;
    for (let i = 0; i < n; i++) s += out[i] * out[i];
    return s;
  };
  const computeJacobian = (): void => {
    jacobianEvaluations++;
    if (problem.jacobian) {
      problem.jacobian(x, jac);
    } else {
      // Central differences, step ∝ ∛ε·max(|θ|, typical) (the error-balancing choice for
      // second-order differences); second-order one-sided next to a bound.
      for (let j = 0; j < p; j++) {
        const xj = x[j];
        const h0 = CBRT_EPS * Math.max(Math.abs(xj), typical[j]);
        if (xj + h0 <= upper[j] && xj - h0 >= lower[j]) {
          const h = (xj + h0) - xj;
          x[j] = xj + h; evaluate(x, rWork);
          x[j] = xj - h; evaluate(x, rWork2);
          x[j] = xj;
          for (let i = 0; i < n; i++) jac[i * p + j] = (rWork[i] - rWork2[i]) / (2 * h);
        } else {
          const sign = xj + h0 <= upper[j] ? 1 : -1;
          const h = (xj + sign * h0) - xj;
          x[j] = xj + h; evaluate(x, rWork);
          x[j] = xj + 2 * h; evaluate(x, rWork2);
          x[j] = xj;
          for (let i = 0; i < n; i++) jac[i * p + j] = (-3 * r[i] + 4 * rWork[i] - rWork2[i]) / (2 * h);
        }
      }
    }
    processJacobian();
  };
  // Gradient, column norms, scaling and the QR factorisation of the Jacobian now in `jac`.
  const processJacobian = (): void => {
    // column by column: sums stay in registers and the column-major copy is written in order
    for (let j = 0; j < p; j++) {
      let g = 0, c = 0;
      const column = j * n;
      for (let i = 0; i < n; i++) {
        let v = jac[i * p + j];
        if (!Number.isFinite(v)) { v = 0; jac[i * p + j] = 0; nonFiniteJacobian = true; }
        g += v * r[i];
        c += v * v;
        qr[column + i] = v;
      }
      grad[j] = g;
      colNorm[j] = c;
    }
    for (let j = 0; j < p; j++) {
      colNorm[j] = Math.sqrt(colNorm[j]);
      diag[j] = Math.max(diag[j], colNorm[j]);
    }
    householderQrColumns(qr, n, p, rdiag, tau);
    qtr.set(r);
    applyQtColumns(qr, n, p, tau, qtr);
  };
  // Solves min ‖[R; √λ·D] s + [top; 0]‖ on the free set into `out` (held parameters get 0).
  const dampedSolve = (lambda: number, top: Float64Array, out: Float64Array): boolean => {
    const root = Math.sqrt(lambda);
    for (let a = 0; a < p; a++) {
      for (let b = 0; b < p; b++) {
        small[a * p + b] = held[b] || b < a ? 0 : b === a ? rdiag[a] : qr[b * n + a];
        small[(p + a) * p + b] = b === a ? (held[a] ? 1 : root * diag[a]) : 0;
      }
      smallRhs[a] = -top[a];
      smallRhs[p + a] = 0;
    }
    householderQr(small, 2 * p, p, smallDiag, smallTau);
    applyQt(small, 2 * p, p, smallTau, smallRhs);
    if (!backSubstitute(small, p, smallDiag, smallRhs, out)) return false;
    for (let j = 0; j < p; j++) {
      if (held[j]) out[j] = 0;
      if (!Number.isFinite(out[j])) return false;
    }
    return true;
  };

  // The workspace is not used after finishing, so the outcome takes its arrays without copies.
  const finish = (reason: StopReason, cost: number): SolverOutcome =>
    ({ x, residuals: r, jacobian: jac, cost, reason,
      iterations, evaluations, jacobianEvaluations, nonFiniteJacobian, nonFiniteTrials });

  let cost: number;
  if (problem.jacobian && problem.jacobianWritesResiduals) {
    // residuals and Jacobian of the start in one model call
    evaluations++; jacobianEvaluations++;
    problem.jacobian(x, jac, r);
    cost = 0;
    for (let i = 0; i < n; i++) cost += r[i] * r[i];
    if (!Number.isFinite(cost)) { jac.fill(0); return finish("invalid-start", cost); }
    processJacobian();
  } else {
    cost = evaluate(x, r);
    if (!Number.isFinite(cost)) return finish("invalid-start", cost);
    computeJacobian();
  }
  for (let j = 0; j < p; j++) if (diag[j] === 0) diag[j] = 1;
  let lambda = options.initialDamping ?? 1e-3;
  let nu = 2;
  let jacobianCurrent = true;
  // Speculative Jacobian: after a good step the next trial is usually accepted too.
  let speculate = false;

  for (;;) {
    if (options.signal?.aborted) return finish("cancelled", cost);
    if (cost === 0) return finish("converged-objective", cost);
    if (!jacobianCurrent) { computeJacobian(); jacobianCurrent = true; }
    // Active set: a parameter on a bound whose descent direction points out of the box.
    let gradientCosine = 0;
    const rnorm = Math.sqrt(cost);
    for (let j = 0; j < p; j++) {
      const g = grad[j];
      held[j] = (x[j] <= lower[j] && g > 0) || (x[j] >= upper[j] && g < 0) || lower[j] === upper[j] ? 1 : 0;
      if (!held[j] && colNorm[j] > 0) gradientCosine = Math.max(gradientCosine, Math.abs(g) / (colNorm[j] * rnorm));
    }
    if (gradientCosine <= gtol) return finish("converged-gradient", cost);
    if (evaluations >= maxEvaluations) return finish("max-evaluations", cost);

    if (!dampedSolve(lambda, qtr, step)) {
      lambda = Math.max(lambda * nu, 1e-12); nu *= 2;
      if (!(lambda < 1e300)) return finish("singular", cost);
      continue;
    }

    // Geodesic acceleration: second directional derivative of r along the step, by a finite
    // difference, projected through the same damped system; used only when small (2|a| ≤ ¾|v|).
    let accelerated = false, tooCurved = false;
    if (geodesic) {
      const hStep = 0.1;
      for (let j = 0; j < p; j++) xTrial[j] = Math.min(upper[j], Math.max(lower[j], x[j] + hStep * step[j]));
      const costProbe = evaluate(xTrial, rWork);
      if (Number.isFinite(costProbe)) {
        for (let i = 0; i < n; i++) {
          let jv = 0;
          const row = i * p;
          for (let j = 0; j < p; j++) jv += jac[row + j] * step[j];
          rWork2[i] = (2 / hStep) * ((rWork[i] - r[i]) / hStep - jv);
        }
        applyQtColumns(qr, n, p, tau, rWork2);
        if (dampedSolve(lambda, rWork2, accel)) {
          let na = 0, nv = 0;
          for (let j = 0; j < p; j++) { na += (diag[j] * accel[j]) ** 2; nv += (diag[j] * step[j]) ** 2; }
          accelerated = 2 * Math.sqrt(na) <= 0.75 * Math.sqrt(nv);
          tooCurved = !accelerated;
        }
      }
    }

    if (tooCurved) {
      // The quadratic model is not trusted this far along a curved path: shrink the step.
      lambda = Math.max(lambda * nu, 1e-12); nu *= 2;
      iterations++;
      if (evaluations >= maxEvaluations) return finish("max-evaluations", cost);
      continue;
    }
    let scaledStep = 0, scaledX = 0;
    for (let j = 0; j < p; j++) {
      const proposed = x[j] + step[j] + (accelerated ? 0.5 * accel[j] : 0);
      xTrial[j] = Math.min(upper[j], Math.max(lower[j], proposed));
      step[j] = xTrial[j] - x[j];
      scaledStep += (diag[j] * step[j]) ** 2;
      scaledX += (diag[j] * x[j]) ** 2;
    }
    scaledStep = Math.sqrt(scaledStep); scaledX = Math.sqrt(scaledX);
    iterations++;

    const speculative = speculate && problem.jacobianWritesResiduals === true && problem.jacobian !== undefined;
    let costTrial: number;
    if (speculative) {
      evaluations++; jacobianEvaluations++;
      problem.jacobian!(xTrial, jacTrial, rTrial);
      costTrial = 0;
      for (let i = 0; i < n; i++) costTrial += rTrial[i] * rTrial[i];
    } else {
      costTrial = evaluate(xTrial, rTrial);
    }
    // Predicted reduction of the linear model: ‖r‖² − ‖r + J s‖² = −Σ_k [2 (Qᵀr)_k (Rs)_k + (Rs)_k²].
    let predicted = 0;
    for (let a = 0; a < p; a++) {
      let rs = rdiag[a] * step[a];
      for (let b = a + 1; b < p; b++) rs += qr[b * n + a] * step[b];
      rStep[a] = rs;
      predicted -= 2 * qtr[a] * rs + rs * rs;
    }
    if (!Number.isFinite(costTrial)) nonFiniteTrials++;
    const actual = cost - costTrial;
    const rho = Number.isFinite(costTrial) && predicted > 0 ? actual / predicted : -1;
    options.onProgress?.({ iteration: iterations, evaluations, cost: Math.min(cost, Number.isFinite(costTrial) ? costTrial : cost), damping: lambda });

    const smallStep = scaledStep <= xtol * (scaledX + xtol);
    if (rho > 1e-4) {
      const previous = cost;
      x.set(xTrial); r.set(rTrial); cost = costTrial;
      jacobianCurrent = false;
      if (speculative) {
        const swap = jac; jac = jacTrial; jacTrial = swap;
        processJacobian();
        jacobianCurrent = true;
      }
      speculate = rho > 0.25;
      lambda *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3); nu = 2;
      const flat = Math.abs(actual) <= ftol * previous && predicted <= ftol * previous;
      if (flat || smallStep) {
        if (!jacobianCurrent) computeJacobian();
        return finish(flat ? "converged-objective" : "converged-step", cost);
      }
    } else {
      speculate = false;
      if (smallStep) return finish(Number.isFinite(costTrial) ? "converged-step" : "non-finite", cost);
      lambda = Math.max(lambda * nu, 1e-12); nu *= 2;
      if (!(lambda < 1e300)) return finish(Number.isFinite(costTrial) ? "converged-step" : "non-finite", cost);
    }
    if (evaluations >= maxEvaluations) {
      if (!jacobianCurrent) { computeJacobian(); jacobianCurrent = true; }
      return finish("max-evaluations", cost);
    }
  }
}
