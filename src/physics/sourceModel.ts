/**
 * A raw-profile model whose fringe visibility comes from the source size: the far-field
 * two-slit pattern with V = V0 · |μ(d)|, |μ| from "coherence-disc" (|2J1(v)/v|, v = πDd/(λR))
 * or "coherence-gaussian" (exp(−2π²σ²d²/(λR)²)) (van Cittert–Zernike theorem; Born & Wolf,
 * §10.4.2–10.4.3). Fitting several profiles taken at different slit separations jointly with the
 * size shared measures the source from the raw data. Analytic derivatives by the chain rule
 * through the two-slit and coherence models' own.
 */
import type { Model, ParameterSpec } from "./model.js";
import { coherenceDiscModel, coherenceGaussianModel } from "./coherence.js";
import { twoSlitModel, type FarFieldOptions } from "./twoSlit.js";

/** Shapes of source the joint model knows, and the parameter that measures each. */
export const SOURCE_SHAPES = { disc: "diameter", gaussian: "rmsSize" } as const;
/** Source shapes of twoSlitSourceModel. */
export type SourceShape = keyof typeof SOURCE_SHAPES;

/**
 * Model "two-slit-<shape>-source": two-slit parameters (visibility now means V0, the visibility
 * an ideal point source would give), then diameter or rmsSize (m) and sourceDistance (m, fixed by
 * default). Positions x in m on the detector, output in counts like "two-slit"; `options` as for
 * "two-slit" (small-angle geometry, quadrature nodes). Registered as "two-slit-disc-source" and
 * "two-slit-gaussian-source".
 * @example fitJoint(profiles.map((profile, i) => ({ profile, model: twoSlitSourceModel("disc"), fix: { separation: d[i] } })), ["diameter", "visibility"])
 */
export function twoSlitSourceModel(shape: SourceShape, options: FarFieldOptions = {}): Model {
  const pattern = twoSlitModel(options);
  const coherence = shape === "disc" ? coherenceDiscModel() : coherenceGaussianModel();
  const sizeName = SOURCE_SHAPES[shape];
  const sizeSpec = coherence.parameters.find((p) => p.name === sizeName)!;
  const sourceDistanceSpec = coherence.parameters.find((p) => p.name === "sourceDistance")!;
  const base = pattern.parameters.map((p): ParameterSpec => (p.name === "visibility"
    ? { ...p, description: "Visibility a point source would give (V0); the source size lowers it." }
    : { ...p }));
  const parameters = [...base, { ...sizeSpec }, { ...sourceDistanceSpec }];
  const iVisibility = base.findIndex((p) => p.name === "visibility");
  const iSeparation = base.findIndex((p) => p.name === "separation");
  const iWavelength = base.findIndex((p) => p.name === "wavelength");
  const B = base.length;
  const P = B + 2;
  const inner = new Float64Array(B);
  const coherenceParams = new Float64Array(4);
  const coherenceGrad = new Float64Array(4);
  const at = new Float64Array(1);
  const mu = new Float64Array(1);
  let patternJac = new Float64Array(0);
  /** Fills `inner` with the two-slit parameters, V = V0·|μ(d)|; |μ| and its gradient when asked. */
  const prepare = (params: Float64Array, withGradient: boolean): void => {
    inner.set(params.subarray(0, B));
    // Coherence model order: visibility (V0 = 1 here), size, sourceDistance, wavelength.
    coherenceParams[0] = 1;
    coherenceParams[1] = params[B];
    coherenceParams[2] = params[B + 1];
    coherenceParams[3] = params[iWavelength];
    at[0] = params[iSeparation];
    if (withGradient) coherence.jacobian!(at, coherenceParams, coherenceGrad, mu);
    else coherence.evaluate(at, coherenceParams, mu);
    inner[iVisibility] = params[iVisibility] * mu[0];
  };
  return {
    id: `two-slit-${shape}-source`,
    description: `Two-slit pattern whose visibility is V0·|μ(d)| for a ${shape === "disc" ? "uniform disc" : "Gaussian"} source`,
    parameters,
    evaluate(x, params, out) {
      prepare(params, false);
      pattern.evaluate(x, inner, out);
    },
    jacobian(x, params, jac, out) {
      prepare(params, true);
      const n = x.length;
      if (patternJac.length < n * B) patternJac = new Float64Array(n * B); // grows once per larger profile
      pattern.jacobian!(x, inner, patternJac, out);
      const v0 = params[iVisibility];
      const size = params[B];
      const d = params[iSeparation];
      // |μ| depends on size·d/(λR) only, so ∂|μ|/∂d = ∂|μ|/∂size · size/d (0 at d = 0, where |μ| is flat).
      const dMuDSeparation = d !== 0 ? (coherenceGrad[1] * size) / d : 0;
      for (let i = 0; i < n; i++) {
        const row = i * P;
        const inRow = i * B;
        for (let j = 0; j < B; j++) jac[row + j] = patternJac[inRow + j];
        const dV = patternJac[inRow + iVisibility]; // ∂I/∂V of the inner pattern
        jac[row + iVisibility] = dV * mu[0];
        jac[row + iSeparation] += dV * v0 * dMuDSeparation;
        jac[row + iWavelength] += dV * v0 * coherenceGrad[3];
        jac[row + B] = dV * v0 * coherenceGrad[1];
        jac[row + B + 1] = dV * v0 * coherenceGrad[2];
      }
    },
  };
}
