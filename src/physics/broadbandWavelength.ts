/**
 * Two-slit pattern from a spectrum Gaussian in WAVELENGTH (as spectrometers report it, FWHM in
 * nm), computed without mapping the spectrum to wavenumber:
 *   I(x) = (A/2) ∫ S(λ) sinc²(π a s/λ) [1 + V cos(2π d s/λ + φ)] dλ,
 *   S(λ) ∝ exp(−(λ − λ0)²/(2σλ²)),  σλ = FWHM/(2√(2 ln 2)),  s = sin θ.
 * With λ = λ0(1 + ε), ε ~ N(0, r²), r = σλ/λ0 and u = 2π d s/λ0:
 *   ⟨e^{iu/(1+ε)} h(ε)⟩ = e^{iu} e^{−u²r²/2} ⟨h(η − i u r²) e^{iu(η − iur²)²/(1 + η − iur²)}⟩_η
 * (completing the square in e^{−iuε} e^{−ε²/2r²}, then moving the contour by −iur²; the
 * integrand is analytic near the real axis since r ≪ 1). What is left varies slowly and is
 * summed by a 24-node Gauss–Hermite rule (Abramowitz & Stegun 25.4.46); the fast oscillation
 * and the coherence decay are exact. The Gaussian-in-wavenumber model ("two-slit-broadband")
 * maps the spectrum to first order, which shifts the mean wavenumber by (σλ/λ0)² relative and
 * so biases the separation by that much (1.2e-4 at 15 nm FWHM around 590 nm).
 * Accuracy against direct integration over λ (mpmath, test/physics/broadbandWavelength.test.ts):
 * 1e-9 relative or better while β0·r ≤ 1.5 (β0 = π a s/λ0, the envelope's argument); beyond,
 * the nodes resolve the envelope's change over the band less well (1e-6 at β0·r = 2.2).
 *
 * Gradient: analytic, in the same pass over the nodes as the value. Each node's term depends on
 * β0 = π a s/λ0, u and r only, through sinc²(β0/(1 + ε')) and e^{iuε'²/(1+ε')} with the shifted
 * node ε' = r t − i u r² (both analytic in ε'), so the node sums are differentiated term by term
 * (complex chain rule through ε') and then chained to the nine parameters. Value and gradient
 * together cost 1.2–1.5 values (measured; the only new transcendental per node is cos of the
 * real envelope argument), against 19 values for central differences.
 */
import type { Model } from "./model.js";
import type { PointPattern } from "./pattern.js";
import { detectorModel } from "./detector.js";
import { directionSine, type SineResult } from "./geometry.js";
import { gaussHermite } from "./quadrature.js";
import { specs } from "./specs.js";
import type { FarFieldOptions } from "./twoSlit.js";

const FWHM_TO_SIGMA = 1 / (2 * Math.sqrt(2 * Math.LN2));
const RULE = gaussHermite(24);
const NODES = Float64Array.from(RULE.nodes, (t) => Math.SQRT2 * t);
const WEIGHTS = Float64Array.from(RULE.weights, (w) => w / Math.sqrt(Math.PI));
/** Beyond |u|·r = 9 the fringe term is below e^{−40} of the mean: taken as 0 (on both sides of
 * the centre: there the contour shift also makes single node terms overflow). */
const COHERENCE_CUTOFF = 9;
/** Entries of one position's gradient: the nine parameters, then ∂I/∂x. */
const STRIDE = 10;

/**
 * sinc z = sin z / z for real z: writes sinc into out[0] and, when `slope`, sinc′ z =
 * (cos z − sinc z)/z into out[1]. Same arithmetic as {@link complexSinc} at im = 0.
 */
function realSinc(z: number, slope: boolean, out: Float64Array): void {
  const z2 = z * z;
  if (z2 < 1e-6) {
    // 1 − z²/6 + z⁴/120; slope −z/3 + z³/30
    out[0] = 1 - z2 / 6 + (z2 * z2) / 120;
    if (slope) out[1] = -z / 3 + (z2 * z) / 30;
  } else {
    const value = (Math.sin(z) * z) / z2;
    out[0] = value;
    if (slope) out[1] = (Math.cos(z) - value) / z;
  }
}

/**
 * sinc z = sin z / z for complex z = (re, im): writes [re, im] into out[0], out[1] and, when
 * `slope`, sinc′ z = (cos z − sinc z)/z into out[2], out[3].
 */
function complexSinc(re: number, im: number, slope: boolean, out: Float64Array): void {
  const d = re * re + im * im;
  if (d < 1e-6) {
    // 1 − z²/6 + z⁴/120; slope −z/3 + z³/30
    const z2r = re * re - im * im, z2i = 2 * re * im;
    const z4r = z2r * z2r - z2i * z2i, z4i = 2 * z2r * z2i;
    out[0] = 1 - z2r / 6 + z4r / 120; out[1] = -z2i / 6 + z4i / 120;
    if (slope) {
      const z3r = z2r * re - z2i * im, z3i = z2r * im + z2i * re;
      out[2] = -re / 3 + z3r / 30; out[3] = -im / 3 + z3i / 30;
    }
  } else {
    const sinRe = Math.sin(re), cosRe = Math.cos(re), coshIm = Math.cosh(im), sinhIm = Math.sinh(im);
    const sinR = sinRe * coshIm, sinI = cosRe * sinhIm;
    const sr = (sinR * re + sinI * im) / d, si = (sinI * re - sinR * im) / d;
    out[0] = sr; out[1] = si;
    if (slope) {
      // cos z = cos re cosh im − i sin re sinh im
      const nr = cosRe * coshIm - sr, ni = -sinRe * sinhIm - si;
      out[2] = (nr * re + ni * im) / d; out[3] = (ni * re - nr * im) / d;
    }
  }
}

/**
 * Point pattern "two-slit-broadband-wavelength". Parameters as "two-slit-broadband": amplitude
 * (counts), center (m), separation (m), width (m), visibility (1), phase (rad), wavelength
 * (centre λ0, m), bandwidth (FWHM in wavelength, m), distance (m). Gradient analytic (module
 * comment); ∂I/∂x per m.
 */
export function twoSlitBroadbandWavelengthPattern(options: { smallAngle?: boolean } = {}): PointPattern {
  const smallAngle = options.smallAngle ?? false;
  const geo: SineResult = { s: 0, dsdu: 0, dsdL: 0 };
  const sinc = new Float64Array(4);
  let amplitude = 0, center = 0, separation = 0, width = 0, visibility = 0, phase = 0;
  let lambda0 = 0, bandwidth = 0, distance = 0;
  /** Intensity at x (m); with `g`, its gradient into g[o … o + 9] (layout of PointPattern.valueGrad). */
  const point = (x: number, g: Float64Array | null, o: number): number => {
    const slope = g !== null;
    directionSine(x - center, distance, smallAngle, geo);
    const s = geo.s;
    const r = (bandwidth * FWHM_TO_SIGMA) / lambda0;
    const u = (2 * Math.PI * separation * s) / lambda0;
    const beta0 = (Math.PI * width * s) / lambda0;
    // Envelope average: Σ w sinc²(β0/(1 + r t)) and its derivatives in β0 and r.
    let mean = 0, meanBeta = 0, meanR = 0;
    for (let j = 0; j < NODES.length; j++) {
      const t = NODES[j]!, w = WEIGHTS[j]!;
      const e = r * t;
      const z = beta0 / (1 + e);
      realSinc(z, slope, sinc);
      const value = sinc[0]!;
      mean += w * (value * value);
      if (slope) {
        const dS = (2 * w * value * sinc[1]!) / (1 + e); // w ∂sinc²(z)/∂β0
        meanBeta += dS;
        meanR -= dS * z * t;
      }
    }
    let fringe = 0, fringeBeta = 0, fringeU = 0, fringeR = 0, fringePhase = 0;
    if (Math.abs(u) * r < COHERENCE_CUTOFF) {
      // G = Σ w h(ε'), h = sinc²(β0 ι) e^{iP}, ι = 1/(1 + ε'), P = u ε'² ι; and ∂G/∂β0, ∂G/∂u, ∂G/∂r
      let gr = 0, gi = 0, bR = 0, bI = 0, uR = 0, uI = 0, rR = 0, rI = 0;
      const r2 = r * r;
      const shift = -u * r * r; // imaginary part of ε'
      for (let j = 0; j < NODES.length; j++) {
        const t = NODES[j]!, w = WEIGHTS[j]!;
        const er = r * t, ei = shift;
        // ι = 1/(1 + ε')
        const dr = 1 + er, den = dr * dr + ei * ei;
        const ir = dr / den, ii = -ei / den;
        complexSinc(beta0 * ir, beta0 * ii, slope, sinc);
        const sr = sinc[0]!, si = sinc[1]!;
        const s2r = sr * sr - si * si, s2i = 2 * sr * si;
        // q = ε'²/(1 + ε'), P = u q
        const e2r = er * er - ei * ei, e2i = 2 * er * ei;
        const qr = e2r * ir - e2i * ii, qi = e2r * ii + e2i * ir;
        const pr = u * qr, pi = u * qi;
        // E = exp(i·(pr + i pi)) = e^{−pi} (cos pr + i sin pr)
        const mag = Math.exp(-pi), cr = mag * Math.cos(pr), ci = mag * Math.sin(pr);
        const ar = s2r * cr - s2i * ci, ai = s2r * ci + s2i * cr; // h
        gr += w * ar;
        gi += w * ai;
        if (!slope) continue;
        // B = (sinc²)′(β0 ι)·E, (sinc²)′ = 2 sinc sinc′
        const d2r = 2 * (sr * sinc[2]! - si * sinc[3]!), d2i = 2 * (sr * sinc[3]! + si * sinc[2]!);
        const br = d2r * cr - d2i * ci, bi = d2r * ci + d2i * cr;
        // ∂h/∂β0 = B ι
        bR += w * (br * ir - bi * ii);
        bI += w * (br * ii + bi * ir);
        // ∂h/∂ε' = −β0 ι² B + i u ε'(2 + ε') ι² h
        const i2r = ir * ir - ii * ii, i2i = 2 * ir * ii;
        const kr = e2r + 2 * er, ki = e2i + 2 * ei;
        const ki2r = kr * i2r - ki * i2i, ki2i = kr * i2i + ki * i2r;
        const m2r = -u * ki2i, m2i = u * ki2r;
        const hr = -beta0 * (br * i2r - bi * i2i) + (ar * m2r - ai * m2i);
        const hi = -beta0 * (br * i2i + bi * i2r) + (ar * m2i + ai * m2r);
        // ∂h/∂u = i q h + ∂h/∂ε' · (−i r²)   (∂ε'/∂u = −i r²)
        uR += w * (-(ar * qi + ai * qr) + hi * r2);
        uI += w * (ar * qr - ai * qi - hr * r2);
        // ∂h/∂r = ∂h/∂ε' · (t − 2i u r)   (∂ε'/∂r)
        const ti = -2 * u * r;
        rR += w * (hr * t - hi * ti);
        rI += w * (hr * ti + hi * t);
      }
      const damping = Math.exp(-0.5 * u * u * r * r);
      const angle = u + phase;
      const cosA = Math.cos(angle), sinA = Math.sin(angle);
      const real = cosA * gr - sinA * gi; // Re(e^{iγ} G)
      fringe = damping * real;
      if (slope) {
        const imag = cosA * gi + sinA * gr; // Im(e^{iγ} G)
        fringePhase = -damping * imag;
        fringeBeta = damping * (cosA * bR - sinA * bI);
        // F = e^{−u²r²/2} Re(e^{i(u+φ)} G(u, r))
        fringeU = damping * (-u * r2 * real - imag + (cosA * uR - sinA * uI));
        fringeR = damping * (-u * u * r * real + (cosA * rR - sinA * rI));
      }
    }
    const value = 0.5 * amplitude * (mean + visibility * fringe); // amplitude = coherent peak
    if (g === null) return value;
    const halfA = 0.5 * amplitude;
    const dBeta = halfA * (meanBeta + visibility * fringeBeta); // ∂I/∂β0
    const dU = halfA * visibility * fringeU; // ∂I/∂u
    const dR = halfA * (meanR + visibility * fringeR); // ∂I/∂r
    const dS = (Math.PI * (dBeta * width + 2 * dU * separation)) / lambda0; // ∂I/∂s
    g[o] = 0.5 * (mean + visibility * fringe);
    g[o + 1] = -dS * geo.dsdu;
    g[o + 2] = (2 * Math.PI * s * dU) / lambda0;
    g[o + 3] = (Math.PI * s * dBeta) / lambda0;
    g[o + 4] = halfA * fringe;
    g[o + 5] = halfA * visibility * fringePhase;
    g[o + 6] = -(dBeta * beta0 + dU * u + dR * r) / lambda0; // β0, u, r ∝ 1/λ0
    g[o + 7] = (dR * FWHM_TO_SIGMA) / lambda0;
    g[o + 8] = dS * geo.dsdL;
    g[o + 9] = dS * geo.dsdu;
    return value;
  };
  return {
    id: "two-slit-broadband-wavelength",
    description: "Two-slit pattern from a spectrum Gaussian in wavelength of FWHM `bandwidth` (no first-order mapping to wavenumber)",
    parameters: specs("amplitude", "center", "separation", "width", "visibility", "phase", "wavelength", "bandwidth", "distance"),
    prepare(p) {
      amplitude = p[0]!; center = p[1]!; separation = p[2]!; width = p[3]!; visibility = p[4]!;
      phase = p[5]!; lambda0 = p[6]!; bandwidth = p[7]!; distance = p[8]!;
    },
    value: (x) => point(x, null, 0),
    valueGrad: (x, g) => point(x, g, 0),
    valuesAt(positions, count, values) {
      for (let t = 0; t < count; t++) values[t] = point(positions[t]!, null, 0);
    },
    valueGradsAt(positions, count, values, grads) {
      for (let t = 0; t < count; t++) values[t] = point(positions[t]!, grads, t * STRIDE);
    },
  };
}

/**
 * Model "two-slit-broadband-wavelength": the pattern above plus detector effects (background,
 * backgroundSlope, pixelWidth, blur). Same parameters as "two-slit-broadband".
 */
export function twoSlitBroadbandWavelengthModel(options: FarFieldOptions = {}): Model {
  return detectorModel(twoSlitBroadbandWavelengthPattern(options), options);
}
