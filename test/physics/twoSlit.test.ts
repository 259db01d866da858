import { describe, expect, it } from "vitest";
import { twoSlitModel, twoSlitPattern } from "../../src/physics/twoSlit.js";
import { paramVector, pixelPositions } from "../../src/physics/simulate.js";
import { checkJacobian } from "./checkJacobian.js";

// B1 truth of the shared benchmark problems (an invented scenario).
const B1 = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, wavelength: 632.8e-9, distance: 1, pixelWidth: 5.5e-6 };

describe("twoSlitModel", () => {
  it("twoSlitModel().evaluate(x, p, out) follows background + A sinc²(πas/λ)[1 + V cos(2πds/λ + φ)] at exact sin θ", () => {
    const model = twoSlitModel();
    const params = paramVector(model, { ...B1, pixelWidth: 0 });
    const x = new Float64Array([-3e-3, 0.37e-3, 1.234e-3, 9e-3]);
    const out = new Float64Array(x.length);
    model.evaluate(x, params, out);
    // the Fraunhofer two-slit formula (Born & Wolf, Principles of Optics, §8.6), written out here independently of the model code
    x.forEach((xi, i) => {
      const u = xi - B1.center;
      const s = u / Math.hypot(u, B1.distance);
      const beta = (Math.PI * B1.width * s) / B1.wavelength;
      const envelope = beta === 0 ? 1 : (Math.sin(beta) / beta) ** 2;
      // amplitude = peak of the fully coherent pattern, so the two-beam sum carries amplitude/2
      const expected = B1.background + (B1.amplitude / 2) * envelope * (1 + B1.visibility * Math.cos((2 * Math.PI * B1.separation * s) / B1.wavelength + B1.phase));
      expect(Math.abs(out[i]! - expected)).toBeLessThan(1e-9 * expected);
    });
  });

  it("twoSlitModel().jacobian matches central differences for every parameter (exact and small-angle, with pixel width and blur)", () => {
    const x = pixelPositions(301, 40e-6, 0.2e-3);
    for (const smallAngle of [false, true]) {
      const model = twoSlitModel({ smallAngle });
      checkJacobian(model, paramVector(model, { ...B1, backgroundSlope: 1e4, pixelWidth: 20e-6, blur: 15e-6 }), x);
      checkJacobian(model, paramVector(model, { ...B1, pixelWidth: 5.5e-6 }), x);
    }
  });

  it("twoSlitPattern().valueGrad is exact at the axis, where sinc is evaluated by its series", () => {
    const pattern = twoSlitPattern();
    const model = twoSlitModel({ pixelNodes: 1 });
    const params = paramVector(model, { ...B1 });
    pattern.prepare(params);
    const grad = new Float64Array(9);
    const value = pattern.valueGrad(B1.center, grad);
    // at s = 0: I = A (1 + V cos φ) exactly
    expect(value).toBeCloseTo((B1.amplitude / 2) * (1 + B1.visibility * Math.cos(B1.phase)), 8);
    checkJacobian(model, params, new Float64Array([B1.center, B1.center + 1e-9, B1.center - 2e-7]));
  });

  it("twoSlitModel() with pixelWidth averages the pattern over the pixel (vs a 2000-point midpoint rule)", () => {
    const model = twoSlitModel();
    const params = paramVector(model, { ...B1 });
    const point = twoSlitModel({ pixelNodes: 1 });
    const pointParams = paramVector(point, { ...B1, pixelWidth: 0 });
    const x = new Float64Array([0.5e-3, 1.7e-3]);
    const got = new Float64Array(2);
    model.evaluate(x, params, got);
    const sub = new Float64Array(2000);
    const values = new Float64Array(2000);
    x.forEach((xi, i) => {
      for (let k = 0; k < 2000; k++) sub[k] = xi - B1.pixelWidth / 2 + ((k + 0.5) * B1.pixelWidth) / 2000;
      point.evaluate(sub, pointParams, values);
      const average = values.reduce((a, b) => a + b, 0) / 2000;
      expect(Math.abs(got[i]! - average)).toBeLessThan(1e-6 * average);
    });
  });
});
