/** What the start heuristics know about a fit: the data, the parameter plan and the known values. */
import { fringeFrequency } from "../autoStart.js";
import type { PreparedFit } from "../preparedFit.js";

/** Read-only view of a prepared fit for the start heuristics. */
export interface StartContext {
  prep: PreparedFit;
  /** The model has a parameter of this name. */
  has(name: string): boolean;
  /** Value known before fitting (fixed value, given start, or the model default), SI. */
  known(name: string): number;
  /** The parameter is free and not given in the start (so a heuristic should guess it). */
  isFree(name: string): boolean;
  /** Mean wavelength (m) of a model without a wavelength parameter (tabulated spectrum), found by probing it. */
  effectiveWavelength(): number;
}

/** Builds the context of a prepared fit. */
export function startContext(prep: PreparedFit): StartContext {
  const names = prep.plan.names;
  const index = (name: string): number => names.indexOf(name);
  return {
    prep,
    has: (name) => index(name) >= 0,
    known: (name) => prep.plan.base[index(name)],
    isFree: (name) => index(name) >= 0 && prep.plan.free.includes(index(name)) && prep.options.start?.[name] === undefined,
    effectiveWavelength: () => probeWavelength(prep),
  };
}

/**
 * Effective wavelength of a two-slit-like model without a wavelength parameter: the model is
 * evaluated with a flat envelope (tiny slit width), visibility 1, separation d0 = 0.5 mm at
 * L = 1 m over ±40 mm, and the fringe frequency ν of the result gives λ = d0/(ν L) (small angle).
 */
function probeWavelength(prep: PreparedFit): number {
  const { model, plan } = prep;
  const set: Record<string, number> = { amplitude: 1, center: 0, separation: 0.5e-3, width: 1e-9, visibility: 1, phase: 0, distance: 1, background: 0, backgroundSlope: 0, pixelWidth: 0, blur: 0 };
  const params = Float64Array.from(plan.base);
  plan.names.forEach((name, j) => { if (set[name] !== undefined) params[j] = set[name]; });
  const n = 2048, dx = 40e-6;
  const x = Float64Array.from({ length: n }, (_, i) => (i - n / 2) * dx);
  const out = new Float64Array(n);
  model.evaluate(x, params, out);
  const found = fringeFrequency(out, dx);
  return found ? 0.5e-3 / found.frequency : 632.8e-9;
}
