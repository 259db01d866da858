// Hand-made FitResult objects for report tests: numbers are invented, shaped like a B1 fit.
import type { FitParameter, FitResult } from "../../src/fit/types.js";
import { goodnessOfFit } from "../../src/fit/goodness.js";

function param(name: string, unit: string, value: number, uncertainty: number, extra: Partial<FitParameter> = {}): FitParameter {
  return { name, unit, value, uncertainty, fixed: uncertainty === 0, tied: null, atBound: null, lower: -Infinity, upper: Infinity, ...extra };
}

/** A converged two-slit fit with fixed wavelength and distance (invented numbers). */
export function makeFitResult(overrides: Partial<FitResult> = {}): FitResult {
  const parameters = [
    param("wavelength", "m", 632.8e-9, 0),
    param("distance", "m", 1, 0),
    param("amplitude", "counts", 20003.7, 21.37),
    param("background", "counts", 150.21, 0.934),
    param("center", "m", 3.70123e-4, 1.234e-7),
    param("separation", "m", 5.00123e-4, 3.41e-7),
    param("width", "m", 1.0012e-4, 2.3e-7),
    param("visibility", "1", 0.85012, 0.00123, { lower: 0, upper: 1 }),
    param("phase", "rad", 0.3012, 0.0118),
  ];
  const free = parameters.filter((p) => !p.fixed);
  const freeNames = free.map((p) => p.name);
  const k = freeNames.length;
  // Uncorrelated: diagonal covariance of the standard errors, identity correlation.
  const covariance = new Float64Array(k * k);
  const correlation = new Float64Array(k * k);
  free.forEach((p, i) => {
    covariance[i * k + i] = p.uncertainty ** 2;
    correlation[i * k + i] = 1;
  });
  const n = 64;
  return {
    modelId: "two-slit",
    noise: "poisson",
    converged: true,
    reason: "converged-step",
    message: "step size below tolerance",
    iterations: 9,
    evaluations: 11,
    jacobianEvaluations: 10,
    parameters,
    freeNames,
    covariance,
    correlation,
    covarianceScaled: false,
    statistics: {
      n, nFree: k, dof: n - k, chi2: 58.3, reducedChi2: 58.3 / (n - k),
      objective: 58.1, logLikelihood: -301.25, aic: 616.5, aicc: 618.5, bic: 631.6,
    },
    warnings: [],
    model: new Float64Array(n).map((_, i) => 150 + 100 * i),
    residuals: new Float64Array(n).map((_, i) => Math.sin(i)),
    flagged: [],
    goodness: goodnessOfFit(58.3, n - k, true),
    ...overrides,
  };
}

/** Strings that try to break out of HTML, Markdown and LaTeX. */
export const HOSTILE = [
  `<script>alert("x")</script>`,
  `"><img src=x onerror=alert(1)>`,
  `\\input{/etc/passwd} \\write18{rm -rf /} $x^2$ & # % _ { } ~ ^ \\`,
  `| pipe | row\nnew line **bold** [link](javascript:alert(1))`,
  `\\end{tabular}\\end{document}`,
  `λ µ ± 中文 \u0007 bell`,
];
