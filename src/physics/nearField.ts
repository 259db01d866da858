/**
 * Near-field (Fresnel) pattern of N identical rectangular slits under unit plane-wave
 * illumination, 1-D Fresnel approximation (Born & Wolf §8.7; Goodman, Introduction to
 * Fourier Optics, §4.2):
 *
 *   U(v) = (1/√(iλL)) Σ_j ∫_{slit j} exp(iπ(v − ξ)²/(λL)) dξ
 *        = (1/√(2i)) Σ_j [E(u_j+) − E(u_j−)],  E(u) = C(u) + i S(u),
 *   u_j± = √(2/(λL)) (c_j ± a/2 − v),  c_j = (j − (N − 1)/2) d,  v = x − center,
 *   I(x) = amplitude · |U|² = amplitude · |Σ_j [E(u_j+) − E(u_j−)]|² / 2.
 *
 * `amplitude` is, as in every model, the peak above background of the fully coherent pattern
 * in the far field of the same slits: the illuminating intensity is amplitude · λL/(N a)²,
 * so that as a²/(λL) → 0 the pattern tends to the small-angle far-field one with peak
 * `amplitude`. In the near field the actual peak differs (a geometric shadow with Fresnel
 * ripples, near the illuminating intensity). Derivatives are analytic: dE/du = exp(iπu²/2).
 * Cost: 2N Fresnel-integral evaluations per sample point, each accurate to ~1e-15.
 */
import type { Model } from "./model.js";
import type { PointPattern } from "./pattern.js";
import { detectorModel, type DetectorOptions } from "./detector.js";
import { fresnelCS, fresnelPhase, type FresnelPair } from "./fresnelIntegrals.js";
import { specs } from "./specs.js";

/**
 * Near-field N-slit point pattern. Parameters: amplitude (counts), center (m),
 * separation (m), width (m), slits (integer ≥ 1, never fitted: Jacobian column 0),
 * wavelength (m), distance (m).
 */
export function nearFieldPattern(): PointPattern {
  const pair: FresnelPair = { c: 0, s: 0 };
  let amplitude = 0, center = 0, separation = 0, width = 0, slits = 2, wavelength = 0, distance = 0, q = 0, scale = 0;
  const evaluate = (x: number, g: Float64Array | null): number => {
    const v = x - center;
    let fr = 0, fi = 0; // F = Σ [E(u+) − E(u−)]
    let vr = 0, vi = 0; // Σ ±e(u) (∂u/∂v = −q for all edges)
    let dr = 0, di = 0; // Σ ±e(u)·offset_j (∂ξ/∂d)
    let ar = 0, ai = 0; // Σ e(u)/2 (∂ξ±/∂a = ±1/2, sign cancels)
    let ur = 0, ui = 0; // Σ ±e(u)·u (for λ and L: ∂u/∂λ = −u/(2λ), ∂u/∂L = −u/(2L))
    for (let j = 0; j < slits; j++) {
      const offset = j - (slits - 1) / 2;
      const middle = offset * separation;
      for (let edge = 0; edge < 2; edge++) {
        const sign = edge === 0 ? 1 : -1;
        const u = q * (middle + sign * 0.5 * width - v);
        fresnelCS(u, pair);
        fr += sign * pair.c;
        fi += sign * pair.s;
        if (!g) continue;
        const angle = fresnelPhase(u);
        const er = Math.cos(angle);
        const ei = Math.sin(angle);
        vr += sign * er; vi += sign * ei;
        dr += sign * er * offset; di += sign * ei * offset;
        ar += 0.5 * er; ai += 0.5 * ei;
        ur += sign * er * u; ui += sign * ei * u;
      }
    }
    const value = 0.5 * amplitude * (fr * fr + fi * fi);
    if (!g) return value;
    // amplitude = peak · λL/(N a)²: ∂/∂a gains −2I/a, ∂/∂λ and ∂/∂L gain I/λ and I/L.
    // ∂I/∂p = amplitude · Re(conj(F) · ∂F/∂p)
    const dV = -q * amplitude * (fr * vr + fi * vi);
    const dLog = -0.5 * amplitude * (fr * ur + fi * ui); // ∂I/∂(ln λ) = ∂I/∂(ln L)
    g[0] = 0.5 * scale * (fr * fr + fi * fi);
    g[1] = -dV;
    g[2] = q * amplitude * (fr * dr + fi * di);
    g[3] = q * amplitude * (fr * ar + fi * ai) - (width > 0 ? (2 * value) / width : 0);
    g[4] = 0;
    g[5] = (dLog + value) / wavelength;
    g[6] = (dLog + value) / distance;
    g[7] = dV;
    return value;
  };
  return {
    id: "two-slit-fresnel",
    description: "Near-field (Fresnel) pattern of N rectangular slits from Fresnel integrals",
    parameters: specs("amplitude", "center", "separation", "width", "slits", "wavelength", "distance"),
    prepare(p) {
      center = p[1]!; separation = p[2]!; width = p[3]!;
      slits = Math.max(1, Math.round(p[4]!)); wavelength = p[5]!; distance = p[6]!;
      q = Math.sqrt(2 / (wavelength * distance));
      // The parameter is the peak of the same slits' far-field pattern; inside, the illuminating
      // intensity = peak · λL/(N a)² (the far-field limit of this pattern has peak illum·(Na)²/(λL)).
      const aperture = slits * width;
      scale = aperture > 0 ? (wavelength * distance) / (aperture * aperture) : 0;
      amplitude = p[0]! * scale;
    },
    value: (x) => evaluate(x, null),
    valueGrad: (x, g) => evaluate(x, g),
  };
}

/**
 * Model "two-slit-fresnel": near-field N-slit pattern plus detector effects. Parameters:
 * amplitude, center, separation, width, slits (default 2), wavelength, distance, background,
 * backgroundSlope, pixelWidth, blur (SI units).
 */
export function nearFieldModel(options: DetectorOptions = {}): Model {
  return detectorModel(nearFieldPattern(), options);
}
