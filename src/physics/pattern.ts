/**
 * Point patterns: noise-free intensity at one detector position, with its gradient.
 * A pattern knows only the optics; `detectorModel` (detector.ts) adds pixel averaging,
 * blur and background, so every optical model gets the same detector effects.
 */
import type { ParameterSpec } from "./model.js";

/** Optical intensity at a single detector position x (m) with analytic gradient. */
export interface PointPattern {
  /** Stable id, e.g. "two-slit". */
  readonly id: string;
  readonly description: string;
  /** Optical parameters; a full params vector starts with these, in this order. */
  readonly parameters: readonly ParameterSpec[];
  /**
   * Reads params[0 … parameters.length − 1] and caches what does not depend on x.
   * Called once per evaluate/jacobian, before any value/valueGrad call.
   */
  prepare(params: Float64Array): void;
  /** Intensity at x (m), using the prepared parameters. */
  value(x: number): number;
  /**
   * Intensity at x (m); writes ∂I/∂params[j] to grad[j] for each optical parameter j and
   * ∂I/∂x (per m) to grad[parameters.length]. Integer parameters get 0.
   */
  valueGrad(x: number, grad: Float64Array): number;
  /**
   * Optional bulk form of `value`: values[t] = value(positions[t]) for t < count (positions in m).
   * detectorModel then makes one call per block of quadrature nodes instead of one per node: a
   * per-node call through its shared call site is not inlined and boxes every returned number.
   */
  valuesAt?(positions: Float64Array, count: number, values: Float64Array): void;
  /**
   * Optional bulk form of `valueGrad`: values[t] as above and the gradient of position t in
   * grads[t·(parameters.length + 1) …], laid out as valueGrad's `grad` (∂I/∂x, per m, last).
   */
  valueGradsAt?(positions: Float64Array, count: number, values: Float64Array, grads: Float64Array): void;
}
