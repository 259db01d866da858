import { describe, it } from "vitest";
import { getModel, listModels } from "../../src/physics/registry.js";
import { paramVector, pixelPositions } from "../../src/physics/simulate.js";
import { checkJacobian } from "./checkJacobian.js";

// Every analytic derivative of every registered model against central differences.
const detectorCases: Record<string, Record<string, number>> = {
  "two-slit": { amplitude: 2e4, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, background: 150, backgroundSlope: 2e3, pixelWidth: 20e-6, blur: 12e-6 },
  "n-slit": { amplitude: 5e3, center: -0.1e-3, separation: 0.3e-3, width: 0.1e-3, slits: 5, pixelWidth: 10e-6, blur: 4e-6, background: 10 },
  "single-slit": { amplitude: 5e3, center: 0.2e-3, width: 0.15e-3, pixelWidth: 10e-6, blur: 20e-6 },
  "two-beam": { amplitude: 3e3, center: 0.1e-3, separation: 0.4e-3, beamWaist: 3e-3, visibility: 0.6, phase: -1.1, pixelWidth: 8e-6 },
  "two-slit-broadband": { amplitude: 2e4, center: 0.2e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.9, phase: 0.4, bandwidth: 40e-9, pixelWidth: 6e-6, blur: 5e-6 },
  "two-slit-broadband-wavelength": { amplitude: 2e4, center: 0.2e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.9, phase: 0.4, bandwidth: 40e-9, pixelWidth: 6e-6, blur: 5e-6 },
  "two-slit-spectrum": { amplitude: 2e4, center: 0.2e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.9, phase: 0.4, pixelWidth: 6e-6 },
  "two-slit-fresnel": { amplitude: 100, center: 0.05e-3, separation: 0.5e-3, width: 0.2e-3, slits: 3, distance: 0.1, pixelWidth: 5e-6, blur: 3e-6 },
};
const spectrum = { wavelengths: [620e-9, 630e-9, 640e-9, 650e-9], weights: [0.5, 1, 0.8, 0.2] };

describe("model.jacobian(x, params, jac, out)", () => {
  for (const [id, values] of Object.entries(detectorCases)) {
    it(`getModel("${id}").jacobian matches central differences for every parameter`, () => {
      // the near-field model has no small-angle variant
      for (const smallAngle of id === "two-slit-fresnel" ? [false] : [false, true]) {
        const model = getModel(id, id === "two-slit-spectrum" ? { smallAngle, spectrum } : { smallAngle });
        const x = pixelPositions(id === "two-slit-fresnel" ? 81 : 241, id === "two-slit-fresnel" ? 60e-6 : 25e-6, 0.013e-3);
        checkJacobian(model, paramVector(model, values), x);
      }
    });
  }
  it('getModel("n-slit") derivatives hold through principal maxima and for N = 1 and N = 40', () => {
    const model = getModel("n-slit");
    // x exactly on the first few principal maxima (small-angle: mλL/d from the centre)
    const x = new Float64Array([0, 632.8e-9 / 0.3e-3, 2 * 632.8e-9 / 0.3e-3, 1e-9, 632.8e-9 / 0.3e-3 + 1e-8]);
    for (const slits of [1, 2, 40]) checkJacobian(getModel("n-slit", { smallAngle: true }), paramVector(model, { slits, separation: 0.3e-3, center: 0 }), x);
  });
  it('getModel("coherence-disc") and ("coherence-gaussian") derivatives hold from d = 0 past the zeros', () => {
    const x = new Float64Array(80).map((_, i) => i * 0.03e-3);
    const disc = getModel("coherence-disc");
    checkJacobian(disc, paramVector(disc, { visibility: 0.9, diameter: 2e-3, sourceDistance: 0.5, wavelength: 550e-9 }), x, { typical: { diameter: 1e-3 } });
    const gauss = getModel("coherence-gaussian");
    checkJacobian(gauss, paramVector(gauss, { visibility: 0.95, rmsSize: 0.4e-3 }), x);
  });
  it("listModels() lists every model with its parameter specs", () => {
    const ids = listModels().map((m) => m.id);
    for (const id of [...Object.keys(detectorCases), "coherence-disc", "coherence-gaussian"]) {
      if (!ids.includes(id)) throw new Error(`listModels() lacks ${id}`);
    }
  });
});
