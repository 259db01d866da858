/**
 * Simulated profiles for demos, tests and benchmarks: model mean plus seeded noise.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Profile } from "../profile.js";
import { createRandom } from "../random.js";
import type { Model } from "./model.js";

/**
 * Pixel centre positions (m) of a line detector centred on the optical axis:
 * x_i = (i − (count − 1)/2) · pitch + offset.
 * @param count  number of pixels (integer ≥ 1)
 * @param pitch  pixel pitch (m, > 0)
 * @param offset shift of the whole line (m), default 0
 * @example pixelPositions(4096, 5.5e-6) // ±11.26 mm around the axis
 */
export function pixelPositions(count: number, pitch: number, offset = 0): Float64Array {
  if (!Number.isInteger(count) || count < 1) throw new InvalidArgumentError("count", count, "an integer ≥ 1");
  if (!(pitch > 0) || !Number.isFinite(pitch)) throw new InvalidArgumentError("pitch", pitch, "a positive length in m");
  if (!Number.isFinite(offset)) throw new InvalidArgumentError("offset", offset, "a finite length in m");
  const x = new Float64Array(count);
  const middle = (count - 1) / 2;
  for (let i = 0; i < count; i++) x[i] = (i - middle) * pitch + offset;
  return x;
}

/** Parameter values by name, or a full vector in model order. */
export type ParameterValues = Float64Array | readonly number[] | Readonly<Record<string, number>>;

/**
 * Full parameter vector (model order, SI) from values by name; missing names take the
 * parameter's default. Unknown names and values outside the bounds throw InvalidArgumentError.
 * @example paramVector(model, { separation: 0.5e-3, width: 0.1e-3 })
 */
export function paramVector(model: Model, values: ParameterValues = {}): Float64Array {
  const p = model.parameters.length;
  const vector = new Float64Array(p);
  if (values instanceof Float64Array || Array.isArray(values)) {
    const list = values as ArrayLike<number>;
    if (list.length !== p) {
      throw new InvalidArgumentError("params", `${list.length} values`, `${p} values for model ${model.id}: ${model.parameters.map((s) => s.name).join(", ")}`);
    }
    for (let j = 0; j < p; j++) vector[j] = list[j]!;
  } else {
    const record = values as Readonly<Record<string, number>>;
    const known = new Set(model.parameters.map((spec) => spec.name));
    for (const name of Object.keys(record)) {
      if (!known.has(name)) {
        throw new InvalidArgumentError("parameter name", name, `model ${model.id} has ${[...known].join(", ")}`);
      }
    }
    model.parameters.forEach((spec, j) => {
      vector[j] = record[spec.name] ?? spec.default;
    });
  }
  checkParameters(model, vector);
  return vector;
}

/**
 * Throws InvalidArgumentError naming the first parameter that is not finite, outside its
 * bounds, or not an integer where one is required.
 */
export function checkParameters(model: Model, params: Float64Array): void {
  model.parameters.forEach((spec, j) => {
    const value = params[j]!;
    if (!Number.isFinite(value)) throw new InvalidArgumentError(spec.name, value, `a finite number in ${spec.unit}`);
    if (value < spec.lower || value > spec.upper) {
      throw new InvalidArgumentError(spec.name, value, `between ${spec.lower} and ${spec.upper} ${spec.unit}`);
    }
    if (spec.integer && !Number.isInteger(value)) throw new InvalidArgumentError(spec.name, value, "an integer");
  });
}

/** Options of `simulateProfile`. */
export interface SimulateOptions {
  /** "poisson": integer counts drawn from the mean; "gaussian": mean + N(0, σ²); "none": the mean. */
  noise?: "poisson" | "gaussian" | "none";
  /** Seed of the random stream (default 1). */
  seed?: number;
  /** Standard deviation for gaussian noise (same unit as y): one number or one per point. */
  sigma?: number | Float64Array;
  /** Unit label of y (default "counts" for poisson, "a.u." otherwise). */
  yUnit?: string;
}

/** A simulated profile with the noise-free mean it was drawn from. */
export interface SimulatedProfile extends Profile {
  /** Model mean at each x (same unit as y). */
  mean: Float64Array;
}

/**
 * Evaluates `model` at positions `x` (m) and adds seeded noise.
 * Poisson noise needs a mean ≥ 0 everywhere; gaussian noise needs `sigma`.
 * @example simulateProfile(twoSlitModel(), paramVector(m, {...}), pixelPositions(4096, 5.5e-6), { noise: "poisson", seed: 7 })
 */
export function simulateProfile(model: Model, params: ParameterValues, x: Float64Array, options: SimulateOptions = {}): SimulatedProfile {
  const noise = options.noise ?? "poisson";
  if (noise !== "poisson" && noise !== "gaussian" && noise !== "none") {
    throw new InvalidArgumentError("noise", noise, `"poisson", "gaussian" or "none"`);
  }
  if (!(x instanceof Float64Array) || x.length === 0) {
    throw new InvalidArgumentError("x", x, "a non-empty Float64Array of positions in m");
  }
  const vector = paramVector(model, params);
  const mean = new Float64Array(x.length);
  model.evaluate(x, vector, mean);
  const rng = createRandom(options.seed ?? 1);
  const y = new Float64Array(x.length);
  let sigma: Float64Array | undefined;
  if (noise === "poisson") {
    for (let i = 0; i < x.length; i++) {
      const m = mean[i]!;
      if (!(m >= 0) || !Number.isFinite(m)) {
        throw new InvalidArgumentError("model mean", m, `≥ 0 at x[${i}] = ${x[i]} m for Poisson noise; raise the background`);
      }
      y[i] = rng.poisson(m);
    }
  } else if (noise === "gaussian") {
    const s = options.sigma;
    if (s === undefined) throw new InvalidArgumentError("sigma", s, "a standard deviation (number or Float64Array) for gaussian noise");
    sigma = new Float64Array(x.length);
    for (let i = 0; i < x.length; i++) {
      const si = typeof s === "number" ? s : s[i]!;
      if (!(si >= 0) || !Number.isFinite(si)) throw new InvalidArgumentError(`sigma[${i}]`, si, "a finite standard deviation ≥ 0");
      sigma[i] = si;
      y[i] = mean[i]! + si * rng.normal();
    }
  } else {
    y.set(mean);
  }
  const profile: SimulatedProfile = {
    x: Float64Array.from(x),
    y,
    yUnit: options.yUnit ?? (noise === "poisson" ? "counts" : "a.u."),
    counts: noise === "poisson",
    mean,
  };
  if (sigma) profile.sigma = sigma;
  return profile;
}
