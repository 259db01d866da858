import { describe, expect, it } from "vitest";
import { getModel, listModels } from "../../src/physics/registry.js";
import { paramVector, pixelPositions } from "../../src/physics/simulate.js";
import { checkJacobian } from "./checkJacobian.js";
import { hasScipy, python } from "./python.js";
import { evaluate } from "./evaluateModel.js";

const LAMBDA = 550e-9; // green line used in the coherence tests (common practice)
const base = { amplitude: 4000, center: 2e-5, separation: 0.6e-3, width: 0.08e-3, visibility: 0.9, phase: 0.2, wavelength: LAMBDA, distance: 1, background: 50 };

describe('getModel("two-slit-disc-source")', () => {
  it.skipIf(!hasScipy)('equals getModel("two-slit") with V = V0 |2 J1(v)/v|, v = π D d/(λ R), |μ| from scipy.special.j1 (van Cittert–Zernike, Born & Wolf §10.4.3)', () => {
    const diameter = 0.4e-3, sourceDistance = 0.8;
    const [mu] = python<number[]>(
      "import json,sys,math\nfrom scipy.special import j1\nd=json.load(sys.stdin)\nv=math.pi*d['D']*d['d']/(d['l']*d['R'])\nprint(json.dumps([abs(2*j1(v)/v)]))",
      { D: diameter, d: base.separation, l: LAMBDA, R: sourceDistance },
    );
    const x = pixelPositions(301, 10e-6, -1.5e-3);
    const got = evaluate("two-slit-disc-source", { ...base, diameter, sourceDistance }, x);
    const want = evaluate("two-slit", { ...base, visibility: base.visibility * mu! }, x);
    // |μ| well inside (0, 1), so the check can tell the source size from none at all
    expect(mu!).toBeGreaterThan(0.2);
    expect(mu!).toBeLessThan(0.9);
    x.forEach((_, i) => expect(Math.abs(got[i]! - want[i]!)).toBeLessThan(1e-9 * base.amplitude));
  });
});

describe('getModel("two-slit-gaussian-source")', () => {
  it("equals two-slit with V = V0 exp(−2π²σ²d²/(λR)²) (Fourier transform of a Gaussian source, common practice)", () => {
    const rmsSize = 0.1e-3, sourceDistance = 1.2;
    const mu = Math.exp((-2 * Math.PI ** 2 * rmsSize ** 2 * base.separation ** 2) / (LAMBDA * sourceDistance) ** 2);
    const x = pixelPositions(301, 10e-6, -1.5e-3);
    const got = evaluate("two-slit-gaussian-source", { ...base, rmsSize, sourceDistance }, x);
    const want = evaluate("two-slit", { ...base, visibility: base.visibility * mu }, x);
    expect(mu).toBeGreaterThan(0.2);
    expect(mu).toBeLessThan(0.9);
    x.forEach((_, i) => expect(Math.abs(got[i]! - want[i]!)).toBeLessThan(1e-9 * base.amplitude));
  });
  it("is listed on the detector axis with the size and sourceDistance after the two-slit parameters", () => {
    const info = listModels().find((m) => m.id === "two-slit-gaussian-source")!;
    expect(info.axis).toBe("detector");
    const names = info.parameters.map((p) => p.name);
    expect(names.slice(0, getModel("two-slit").parameters.length)).toEqual(getModel("two-slit").parameters.map((p) => p.name));
    expect(names.slice(-2)).toEqual(["rmsSize", "sourceDistance"]);
  });
});

describe('getModel("two-slit-<shape>-source").jacobian(x, params, jac, out)', () => {
  const x = pixelPositions(241, 25e-6, 0.013e-3);
  // v = πDd/(λR): 1.4 (first lobe) and 5 (past the first zero of J1 at 3.83, A&S Table 9.5)
  for (const [label, diameter] of [["first lobe", 0.4e-3], ["second lobe", 1.46e-3]] as const) {
    it(`"two-slit-disc-source" matches central differences for every parameter (${label}, exact and small-angle)`, () => {
      for (const smallAngle of [false, true]) {
        const model = getModel("two-slit-disc-source", { smallAngle });
        checkJacobian(model, paramVector(model, { ...base, diameter, sourceDistance: 1, pixelWidth: 20e-6, blur: 12e-6 }), x, { typical: { diameter: 1e-3 } });
      }
    });
  }
  it('"two-slit-gaussian-source" matches central differences for every parameter', () => {
    const model = getModel("two-slit-gaussian-source");
    checkJacobian(model, paramVector(model, { ...base, rmsSize: 0.15e-3, sourceDistance: 1.2, backgroundSlope: 2e3, pixelWidth: 20e-6 }), x);
  });
});
