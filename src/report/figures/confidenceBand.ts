/**
 * Pointwise confidence band of a fitted curve by the delta method:
 * var f(x) = g(x)ᵀ C g(x), g = ∂f/∂θ over the free parameters, C their covariance
 * (e.g. Seber & Wild, Nonlinear Regression, 1989, §5.1). Band = f ± z·sqrt(var), z the
 * two-sided normal quantile of `level`.
 */
import { InvalidArgumentError } from "../../errors.js";
import type { FitResult } from "../../fit/types.js";
import type { Model } from "../../physics/model.js";
import { normalQuantile } from "../../math/normal.js";

/** A curve with its pointwise lower and upper confidence limits (model units). */
export interface Band {
  /** Curve at x (model unit). */
  center: Float64Array;
  lower: Float64Array;
  upper: Float64Array;
  /** Confidence level, e.g. 0.95. */
  level: number;
}

/**
 * Confidence band of `model` at `x` for the fitted parameters of `result`.
 * Derivatives by central differences with steps of 10⁻³ standard errors (the curve is
 * locally linear over that range); parameters with no finite uncertainty add nothing.
 * @param x     positions (model's x unit, SI)
 * @param level confidence level in (0, 1), default 0.95
 */
export function confidenceBand(model: Model, result: FitResult, x: Float64Array, level = 0.95): Band {
  if (!(level > 0 && level < 1)) throw new InvalidArgumentError("level", level, "a confidence level between 0 and 1, e.g. 0.95");
  if (model.parameters.length !== result.parameters.length) {
    throw new InvalidArgumentError("model", model.id, `the model the result was fitted with (${result.modelId}, ${result.parameters.length} parameters)`);
  }
  const params = Float64Array.from(result.parameters, (p) => p.value);
  const center = new Float64Array(x.length);
  model.evaluate(x, params, center);
  const k = result.freeNames.length;
  const gradients: Float64Array[] = [];
  const plus = new Float64Array(x.length);
  const minus = new Float64Array(x.length);
  for (const name of result.freeNames) {
    const j = result.parameters.findIndex((p) => p.name === name);
    const se = result.parameters[j].uncertainty;
    const g = new Float64Array(x.length);
    if (Number.isFinite(se) && se > 0) {
      const h = 1e-3 * se;
      const saved = params[j];
      params[j] = saved + h;
      model.evaluate(x, params, plus);
      params[j] = saved - h;
      model.evaluate(x, params, minus);
      params[j] = saved;
      for (let i = 0; i < x.length; i++) g[i] = (plus[i] - minus[i]) / (2 * h);
    }
    gradients.push(g);
  }
  const z = normalQuantile(0.5 + level / 2);
  const lower = new Float64Array(x.length);
  const upper = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) {
    let variance = 0;
    for (let a = 0; a < k; a++) {
      for (let b = 0; b < k; b++) {
        const c = result.covariance[a * k + b];
        if (Number.isFinite(c)) variance += gradients[a][i] * c * gradients[b][i];
      }
    }
    const half = z * Math.sqrt(Math.max(variance, 0));
    lower[i] = center[i] - half;
    upper[i] = center[i] + half;
  }
  return { center, lower, upper, level };
}
