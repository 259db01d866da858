/**
 * Models by id, for the command line, result files and widgets.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model, ParameterSpec } from "./model.js";
import { rememberModelSource } from "./modelSource.js";
import { twoSlitModel } from "./twoSlit.js";
import { nSlitModel, singleSlitModel } from "./nSlit.js";
import { twoBeamModel } from "./twoBeam.js";
import { twoSlitBroadbandModel, twoSlitSpectrumModel, type SpectrumTable } from "./broadband.js";
import { nearFieldModel } from "./nearField.js";
import { twoSlitBroadbandWavelengthModel } from "./broadbandWavelength.js";
import { coherenceDiscModel, coherenceGaussianModel } from "./coherence.js";
import { twoSlitSourceModel } from "./sourceModel.js";

/** Options accepted by `getModel`; each model reads the ones it knows. */
export interface ModelOptions {
  /** Far-field models: sin θ ≈ (x − center)/distance. */
  smallAngle?: boolean;
  /** Gauss–Legendre nodes per pixel (default 5). */
  pixelNodes?: number;
  /** Gauss–Hermite nodes for blur (default 16). */
  blurNodes?: number;
  /** "two-slit-spectrum" only: the source spectrum table (wavelengths in m). */
  spectrum?: SpectrumTable;
  [option: string]: unknown;
}

/** A registry entry as listed by `listModels`. */
export interface ModelInfo {
  id: string;
  description: string;
  parameters: readonly ParameterSpec[];
  /** Position axis: "detector" (x = detector position, m) or "separation" (x = slit separation, m). */
  axis: "detector" | "separation";
}

interface Entry {
  axis: "detector" | "separation";
  create: (options: ModelOptions) => Model;
  /** Options needed to build an example instance for listing (models that need data). */
  example?: ModelOptions;
}

const ENTRIES: Record<string, Entry> = {
  "two-slit": { axis: "detector", create: (o) => twoSlitModel(o) },
  "n-slit": { axis: "detector", create: (o) => nSlitModel(o) },
  "single-slit": { axis: "detector", create: (o) => singleSlitModel(o) },
  "two-beam": { axis: "detector", create: (o) => twoBeamModel(o) },
  "two-slit-broadband": { axis: "detector", create: (o) => twoSlitBroadbandModel(o) },
  "two-slit-broadband-wavelength": { axis: "detector", create: (o) => twoSlitBroadbandWavelengthModel(o) },
  "two-slit-spectrum": {
    axis: "detector",
    create: (o) => {
      if (!o.spectrum) {
        throw new InvalidArgumentError("spectrum option", o.spectrum, 'a table { wavelengths, weights } for model "two-slit-spectrum"');
      }
      return twoSlitSpectrumModel(o.spectrum, o);
    },
    example: { spectrum: { wavelengths: [632.8e-9], weights: [1] } },
  },
  "two-slit-fresnel": { axis: "detector", create: (o) => nearFieldModel(o) },
  "two-slit-disc-source": { axis: "detector", create: (o) => twoSlitSourceModel("disc", o) },
  "two-slit-gaussian-source": { axis: "detector", create: (o) => twoSlitSourceModel("gaussian", o) },
  "coherence-disc": { axis: "separation", create: () => coherenceDiscModel() },
  "coherence-gaussian": { axis: "separation", create: () => coherenceGaussianModel() },
};

/**
 * Builds the model with the given id.
 * @param id      one of `listModels().map(m => m.id)`
 * @param options model options (small-angle geometry, quadrature nodes, spectrum, ...)
 * @example getModel("two-slit", { smallAngle: true })
 */
export function getModel(id: string, options: ModelOptions = {}): Model {
  const entry = Object.hasOwn(ENTRIES, id) ? ENTRIES[id] : undefined;
  if (!entry) throw new InvalidArgumentError("model id", id, `one of ${Object.keys(ENTRIES).join(", ")}`);
  checkOptions(options);
  return rememberModelSource(entry.create(options), { id, options: { ...options } });
}

const OPTION_NAMES = ["smallAngle", "pixelNodes", "blurNodes", "spectrum"];

/** Rejects misspelt options and wrong types before any model is built. */
function checkOptions(options: ModelOptions): void {
  if (typeof options !== "object" || options === null) throw new InvalidArgumentError("model options", options, "an object");
  for (const name of Object.keys(options)) {
    if (!OPTION_NAMES.includes(name)) throw new InvalidArgumentError("model option", name, `one of ${OPTION_NAMES.join(", ")}`);
  }
  if (options.smallAngle !== undefined && typeof options.smallAngle !== "boolean") {
    throw new InvalidArgumentError("smallAngle", options.smallAngle, "true or false");
  }
}

/** All registered models: id, description, parameter specs and position axis. */
export function listModels(): ModelInfo[] {
  return Object.entries(ENTRIES).map(([id, entry]) => {
    const model = entry.create(entry.example ?? {});
    return { id, description: model.description, parameters: model.parameters, axis: entry.axis };
  });
}
