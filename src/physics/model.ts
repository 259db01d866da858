/**
 * The contract every interference model fulfils. Models are pure: SI numbers in,
 * intensities out, no allocation inside evaluate/jacobian after construction.
 */

/** Description of one model parameter. Values are SI (m, rad, counts, ...). */
export interface ParameterSpec {
  /** Project-wide name: wavelength, distance, separation, width, slits, center, amplitude,
   * background, backgroundSlope, visibility, phase, bandwidth, pixelWidth, blur, beamWaist, ... */
  name: string;
  /** SI unit symbol ("m", "rad", "counts", "1" for dimensionless). */
  unit: string;
  /** Default value (SI). */
  default: number;
  /** Lower and upper physical bounds (SI); ±Infinity when unbounded. */
  lower: number;
  upper: number;
  /** Meaning, one short sentence. */
  description: string;
  /** True when the parameter is normally known and held fixed (e.g. wavelength, distance, slits). */
  fixedByDefault?: boolean;
  /** True when only integer values make sense (slits). Integer parameters are never fitted. */
  integer?: boolean;
}

/** A model of intensity against detector position. */
export interface Model {
  /** Stable id used by the command line and result files (e.g. "two-slit"). */
  readonly id: string;
  /** One-line description. */
  readonly description: string;
  /** Parameters in the order used by every params vector. */
  readonly parameters: readonly ParameterSpec[];
  /**
   * Intensity at each position.
   * @param x      detector positions (m), length n
   * @param params parameter values (SI) in the order of `parameters`
   * @param out    receives the intensity, length n
   */
  evaluate(x: Float64Array, params: Float64Array, out: Float64Array): void;
  /**
   * Analytic partial derivatives. `jac` is row-major n × p: jac[i * p + j] = ∂I(x_i)/∂params[j].
   * Also writes the intensity to `out` when given (cheap, shares work).
   * Absent when the model has no analytic derivatives (the fitter then differentiates numerically).
   * @param columns optional mask, length p: where columns[j] is 0 the caller does not need column j
   *   (e.g. a fixed parameter); a model may then skip its work and write 0 there. Models that
   *   ignore the mask stay correct.
   */
  jacobian?(x: Float64Array, params: Float64Array, jac: Float64Array, out?: Float64Array, columns?: Uint8Array): void;
}
