/**
 * Parameter specifications shared by the models, so a name means the same thing,
 * unit and bounds everywhere. Defaults are a typical He–Ne two-slit bench (common practice).
 */
import type { ParameterSpec } from "./model.js";

/** Builds the spec list for the given project-wide names (in the given order). */
export function specs(...names: SpecName[]): ParameterSpec[] {
  return names.map((name) => ({ ...SPECS[name] }));
}

/** The project-wide parameter names that have a shared spec (see DEVELOPERS.md conventions). */
export type SpecName = keyof typeof SPECS;

const SPECS = {
  amplitude: { name: "amplitude", unit: "counts", default: 1000, lower: 0, upper: Infinity,
    description: "Peak above background of the fully coherent pattern (visibility 1, narrow band, point source; far-field peak for near-field models)." },
  center: { name: "center", unit: "m", default: 0, lower: -Infinity, upper: Infinity,
    description: "Detector position of the optical axis (pattern centre)." },
  separation: { name: "separation", unit: "m", default: 0.5e-3, lower: 0, upper: Infinity,
    description: "Centre-to-centre slit spacing d." },
  width: { name: "width", unit: "m", default: 0.1e-3, lower: 0, upper: Infinity,
    description: "Slit width a." },
  slits: { name: "slits", unit: "1", default: 2, lower: 1, upper: 100000,
    description: "Number of slits N.", fixedByDefault: true, integer: true },
  visibility: { name: "visibility", unit: "1", default: 1, lower: 0, upper: 1,
    description: "Fringe visibility V = (Imax − Imin)/(Imax + Imin) of the two-beam term." },
  phase: { name: "phase", unit: "rad", default: 0, lower: -Infinity, upper: Infinity,
    description: "Extra phase between the two beams." },
  wavelength: { name: "wavelength", unit: "m", default: 632.8e-9, lower: 0, upper: Infinity,
    description: "Vacuum (centre) wavelength of the light.", fixedByDefault: true },
  distance: { name: "distance", unit: "m", default: 1, lower: 0, upper: Infinity,
    description: "Distance from the slits to the detector.", fixedByDefault: true },
  bandwidth: { name: "bandwidth", unit: "m", default: 1e-9, lower: 0, upper: Infinity,
    description: "Full width at half maximum of the source spectrum, in wavelength." },
  beamWaist: { name: "beamWaist", unit: "m", default: 2e-3, lower: 0, upper: Infinity,
    description: "1/e² intensity radius of a Gaussian envelope on the detector." },
  diameter: { name: "diameter", unit: "m", default: 1e-3, lower: 0, upper: Infinity,
    description: "Diameter of the uniform circular source." },
  rmsSize: { name: "rmsSize", unit: "m", default: 0.5e-3, lower: 0, upper: Infinity,
    description: "RMS width of the Gaussian source intensity along the slit-separation direction." },
  sourceDistance: { name: "sourceDistance", unit: "m", default: 1, lower: 0, upper: Infinity,
    description: "Distance from the source to the slit plane.", fixedByDefault: true },
} satisfies Record<string, ParameterSpec>;
