/**
 * Pure computations behind the explorer's live preview: which points a fit would use,
 * the model curve for the slider values, and residuals. No DOM, so they are unit-tested in Node.
 */
import { scaledResiduals, type ResidualScale } from "../../src/fit/residualScale.js";
import type { Model } from "../../src/physics/model.js";

/** Per-parameter state the explorer keeps (SI values and bounds). */
export interface ParamState {
  value: number;
  fixed: boolean;
  lower: number;
  upper: number;
}

/**
 * Points used by a fit: the profile's own mask, inside the fit window, outside every masked range.
 * @param x       positions (m)
 * @param mask    the profile's mask (1 = usable) or null
 * @param window  [from, to] (m) or null for the whole profile
 * @param ranges  masked intervals [from, to] (m), either order
 * @returns 1 = used, 0 = excluded, one byte per point
 */
export function effectiveMask(
  x: Float64Array,
  mask: Uint8Array | null,
  window: readonly [number, number] | null,
  ranges: readonly (readonly [number, number])[],
): Uint8Array {
  const used = new Uint8Array(x.length);
  const lo = window ? Math.min(window[0], window[1]) : -Infinity;
  const hi = window ? Math.max(window[0], window[1]) : Infinity;
  const sorted = ranges.map(([a, b]) => [Math.min(a, b), Math.max(a, b)] as const);
  for (let i = 0; i < x.length; i++) {
    const xi = x[i]!;
    let ok = (mask === null || mask[i] === 1) && xi >= lo && xi <= hi;
    for (let k = 0; ok && k < sorted.length; k++) {
      if (xi >= sorted[k]![0] && xi <= sorted[k]![1]) ok = false;
    }
    used[i] = ok ? 1 : 0;
  }
  return used;
}

/**
 * Parameter vector in model order from the explorer's state; missing names take the model default.
 * Writes into `out` (length = model.parameters.length) so slider moves allocate nothing.
 */
export function paramVector(model: Model, params: Record<string, ParamState>, out: Float64Array): Float64Array {
  model.parameters.forEach((spec, j) => {
    const state = params[spec.name];
    out[j] = state !== undefined && Number.isFinite(state.value) ? state.value : spec.default;
  });
  return out;
}

/**
 * Explorer state for a model: its parameters' defaults, keeping values the old state already had.
 * Infinite bounds arrive as null (JSON has no Infinity) and become ±Infinity again here.
 */
export function paramsForModel(model: Model, previous: Record<string, ParamState> = {}): Record<string, ParamState> {
  const next: Record<string, ParamState> = {};
  for (const spec of model.parameters) {
    const old = previous[spec.name];
    next[spec.name] = old !== undefined
      ? {
          value: typeof old.value === "number" ? old.value : spec.default,
          fixed: old.fixed === true,
          lower: typeof old.lower === "number" ? old.lower : -Infinity,
          upper: typeof old.upper === "number" ? old.upper : Infinity,
        }
      : { value: spec.default, fixed: spec.fixedByDefault === true || spec.integer === true, lower: spec.lower, upper: spec.upper };
  }
  return next;
}

/**
 * Residuals (y − f)/s into `out`, NaN where unused, with s as the fitter takes it for the noise
 * model (see residualScale: √f for Poisson, σ when given, √y for counts, else 1).
 */
export function residuals(
  y: Float64Array,
  f: Float64Array,
  sigma: Float64Array | null,
  scale: ResidualScale,
  used: Uint8Array,
  out: Float64Array,
): Float64Array {
  return scaledResiduals(y, f, sigma, scale, used, out);
}

/**
 * Slider range for a parameter: the value ± its own magnitude, clipped to the bounds
 * (a range that follows the value works for quantities spanning nm to counts of 10⁵).
 * A zero value gets ± `zeroSpan` (SI), e.g. π for a phase or 100 µm for a length.
 */
export function sliderRange(value: number, lower: number, upper: number, zeroSpan = 1): [number, number] {
  const span = Math.abs(value) > 0 ? Math.abs(value) : zeroSpan;
  let lo = Math.max(lower, value - span);
  let hi = Math.min(upper, value + span);
  if (!(hi > lo) || !Number.isFinite(hi - lo)) {
    lo = value - 1;
    hi = value + 1;
  }
  return [lo, hi];
}

/**
 * After a model switch, scale the new model's amplitude so the curve's highest point over `x`
 * stays where the old curve's was (above the background), so the sliders still sit on the data.
 * Models differ in what `amplitude` multiplies (one beam, or the peak); the height is what a user
 * sees. Changes `next.amplitude.value` in place; does nothing when either curve has no height.
 * @param x        positions (m)
 * @param before   the old model and its parameter vector (model order)
 * @param after    the new model; `next` its slider state (amplitude, background by name)
 */
export function keepCurveHeight(x: Float64Array, before: Model, beforeParams: Float64Array, after: Model, next: Record<string, ParamState>): void {
  const amplitude = next.amplitude;
  if (amplitude === undefined || x.length === 0) return;
  const peak = (model: Model, params: Float64Array): number => {
    const out = new Float64Array(x.length);
    model.evaluate(x, params, out);
    let top = -Infinity;
    for (const v of out) if (v > top) top = v;
    return top;
  };
  const background = next.background?.value ?? 0;
  const wanted = peak(before, beforeParams) - background;
  const now = peak(after, paramVector(after, next, new Float64Array(after.parameters.length))) - background;
  const scale = wanted / now;
  if (wanted > 0 && now > 0 && Number.isFinite(scale)) amplitude.value *= scale;
}
