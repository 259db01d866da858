/**
 * Pure computations behind the explorer's live preview: which points a fit would use,
 * the model curve for the slider values, and residuals. No DOM, so they are unit-tested in Node.
 */
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
 * Residuals (y − f)/s into `out`, NaN where unused. s = σ when given; √max(f, 1) for counts
 * (Pearson residuals, common practice for Poisson data); otherwise 1 (plain y − f).
 */
export function residuals(
  y: Float64Array,
  f: Float64Array,
  sigma: Float64Array | null,
  poisson: boolean,
  used: Uint8Array,
  out: Float64Array,
): Float64Array {
  for (let i = 0; i < y.length; i++) {
    if (used[i] !== 1) {
      out[i] = NaN;
      continue;
    }
    const s = sigma !== null ? sigma[i]! : poisson ? Math.sqrt(Math.max(f[i]!, 1)) : 1;
    out[i] = (y[i]! - f[i]!) / s;
  }
  return out;
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
