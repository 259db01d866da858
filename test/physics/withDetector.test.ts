import { describe, expect, it } from "vitest";
import type { Model } from "../../src/physics/model.js";
import { withDetector } from "../../src/physics/withDetector.js";
import { getModel } from "../../src/physics/registry.js";
import { twoSlitPattern } from "../../src/physics/twoSlit.js";
import { paramVector, pixelPositions } from "../../src/physics/simulate.js";
import { checkJacobian } from "./checkJacobian.js";

/** The bare two-slit pattern as a plain Model, the way a user's formula model would arrive. */
function bareTwoSlit(withJacobian: boolean): Model {
  const pattern = twoSlitPattern();
  const grad = new Float64Array(9);
  const model: Model = {
    id: "bare",
    description: "two-slit optics only",
    parameters: pattern.parameters,
    evaluate(x, p, out) {
      pattern.prepare(p);
      for (let i = 0; i < x.length; i++) out[i] = pattern.value(x[i]!);
    },
  };
  if (withJacobian) {
    model.jacobian = (x, p, jac, out) => {
      pattern.prepare(p);
      for (let i = 0; i < x.length; i++) {
        const v = pattern.valueGrad(x[i]!, grad);
        for (let j = 0; j < 8; j++) jac[i * 8 + j] = grad[j]!;
        if (out) out[i] = v;
      }
    };
  }
  return model;
}

const VALUES = { amplitude: 2e4, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, background: 150, backgroundSlope: 1e3, pixelWidth: 12e-6, blur: 6e-6 };

describe("withDetector(model, options)", () => {
  it("withDetector(bare two-slit) reproduces getModel(\"two-slit\") values and Jacobian", () => {
    const x = pixelPositions(201, 30e-6, 0.1e-3);
    const reference = getModel("two-slit");
    const p = paramVector(reference, VALUES);
    for (const withJacobian of [true, false]) {
      const wrapped = withDetector(bareTwoSlit(withJacobian));
      expect(wrapped.parameters.map((s) => s.name)).toEqual(reference.parameters.map((s) => s.name));
      const a = new Float64Array(x.length), b = new Float64Array(x.length);
      wrapped.evaluate(x, p, a);
      reference.evaluate(x, p, b);
      x.forEach((_, i) => expect(Math.abs(a[i]! - b[i]!)).toBeLessThan(1e-9 * b[i]!));
      const ja = new Float64Array(x.length * 12), jb = new Float64Array(x.length * 12);
      wrapped.jacobian!(x, p, ja);
      reference.jacobian!(x, p, jb);
      for (let j = 0; j < 12; j++) {
        let scale = 0, worst = 0;
        for (let i = 0; i < x.length; i++) {
          scale = Math.max(scale, Math.abs(jb[i * 12 + j]!));
          worst = Math.max(worst, Math.abs(ja[i * 12 + j]! - jb[i * 12 + j]!));
        }
        expect(worst, `column ${reference.parameters[j]!.name}`).toBeLessThan((withJacobian ? 1e-7 : 1e-4) * scale + 1e-12);
      }
      checkJacobian(wrapped, p, x, { tolerance: withJacobian ? 1e-6 : 1e-4 });
    }
  });
  it("withDetector rejects a model that already has a background parameter", () => {
    expect(() => withDetector(getModel("two-slit"))).toThrow(/invalid model: "two-slit" \(a model without its own "background"/);
  });
});
