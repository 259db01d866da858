import { describe, expect, it } from "vitest";
import { getModel } from "../../src/physics/registry.js";
import { paramVector, pixelPositions } from "../../src/physics/simulate.js";

// B1 truth of the shared benchmark problems (an invented scenario), with blur so every detector column is live.
const B1 = { amplitude: 20000, background: 150, center: 0.37e-3, separation: 0.5e-3, width: 0.1e-3, visibility: 0.85, phase: 0.3, wavelength: 632.8e-9, distance: 1, pixelWidth: 5.5e-6, blur: 3e-6 };

describe("Model.jacobian(x, params, jac, out, columns)", () => {
  // The mask is defined by the Model contract (src/physics/model.ts): wanted columns equal the
  // unmasked Jacobian, which the model tests check against central differences; others are 0.
  for (const id of ["two-slit", "n-slit", "two-beam"]) {
    it(`${id}: masked columns are 0, the others equal the full Jacobian bit for bit`, () => {
      const model = getModel(id);
      const p = model.parameters.length;
      const params = paramVector(model, Object.fromEntries(Object.entries(B1).filter(([k]) => model.parameters.some((s) => s.name === k))));
      const x = pixelPositions(257, 5.5e-6);
      const full = new Float64Array(x.length * p), fullOut = new Float64Array(x.length);
      model.jacobian!(x, params, full, fullOut);
      for (const keep of [[0, 1], [p - 2, p - 1], [...Array(p).keys()].filter((j) => j % 2 === 0)]) {
        const columns = new Uint8Array(p);
        for (const j of keep) columns[j] = 1;
        const jac = new Float64Array(x.length * p).fill(NaN), out = new Float64Array(x.length);
        model.jacobian!(x, params, jac, out, columns);
        expect(Array.from(out)).toEqual(Array.from(fullOut));
        for (let i = 0; i < x.length; i++) {
          for (let j = 0; j < p; j++) {
            const got = jac[i * p + j]!;
            if (columns[j]) expect(got).toBe(full[i * p + j]);
            else expect(Number.isFinite(got) && (got === 0 || got === full[i * p + j])).toBe(true);
          }
        }
      }
    });
  }

  it("two-slit: the value-only path equals the value written by the Jacobian path", () => {
    const model = getModel("two-slit");
    const params = paramVector(model, B1);
    const x = pixelPositions(1000, 5.5e-6);
    const a = new Float64Array(x.length), b = new Float64Array(x.length);
    model.evaluate(x, params, a);
    model.jacobian!(x, params, new Float64Array(x.length * model.parameters.length), b);
    for (let i = 0; i < x.length; i++) expect(Math.abs(a[i]! - b[i]!)).toBeLessThanOrEqual(1e-12 * Math.abs(b[i]!));
  });
});
