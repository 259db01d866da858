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
}
