// Shared helper (not a test file): brute-force diffraction integrals of slit apertures,
// computed by composite Gauss–Legendre quadrature of the aperture, independent of the
// closed forms used by the models.
import { gaussLegendre } from "../../src/physics/quadrature.js";

const RULE = gaussLegendre(20);

/** A slit: centre (m), width (m), complex amplitude transmission (re, im). */
export interface Slit { center: number; width: number; re: number; im: number }

/** ∫ over each slit of t · exp(i φ(ξ)) dξ, with `panels` sub-intervals per slit. */
function integrate(slits: Slit[], phase: (xi: number) => number, panels: number): [number, number] {
  let re = 0;
  let im = 0;
  for (const slit of slits) {
    const h = slit.width / panels;
    for (let p = 0; p < panels; p++) {
      const a = slit.center - slit.width / 2 + p * h;
      let pr = 0;
      let pi = 0;
      for (let k = 0; k < RULE.nodes.length; k++) {
        const xi = a + (h * (RULE.nodes[k]! + 1)) / 2;
        const w = (RULE.weights[k]! * h) / 2;
        const angle = phase(xi);
        pr += w * Math.cos(angle);
        pi += w * Math.sin(angle);
      }
      re += slit.re * pr - slit.im * pi;
      im += slit.re * pi + slit.im * pr;
    }
  }
  return [re, im];
}

/** Fraunhofer: |∫ t(ξ) exp(−i k s ξ) dξ|² (m²) at direction sine s. */
export function fraunhoferIntensity(slits: Slit[], wavelength: number, s: number, panels = 16): number {
  const k = (2 * Math.PI) / wavelength;
  const [re, im] = integrate(slits, (xi) => -k * s * xi, panels);
  return re * re + im * im;
}

/** Fresnel (paraxial): |U(v)|² with U = (1/√(iλL)) ∫ t(ξ) exp(iπ(v − ξ)²/(λL)) dξ (dimensionless). */
export function fresnelIntensity(slits: Slit[], wavelength: number, distance: number, v: number, panels = 64): number {
  const scale = Math.PI / (wavelength * distance);
  const [re, im] = integrate(slits, (xi) => scale * (v - xi) * (v - xi), panels);
  return (re * re + im * im) / (wavelength * distance);
}
