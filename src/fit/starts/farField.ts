/**
 * Candidate starts for the far-field line models, from the data and the known geometry:
 *   - two-slit, single-slit, n-slit, broadband, tabulated spectrum and the source-size models
 *     build on autoStartCandidates (fringe period from the spectrum → separation, one-period
 *     moving average → envelope → slit width, mirror symmetry → centre, linear fit → visibility
 *     and phase);
 *   - n-slit: the grating factor's fundamental is its strongest Fourier component, so the same
 *     period gives the separation; halves and doubles are added in case a harmonic won;
 *   - two-slit-broadband: a ladder of bandwidths whose damping of the fringes at the window's edge
 *     (exp(−q²/2), q = σk·d·s_max) runs from none to strong, visibility raised to match;
 *   - source-size models (V = V0·|μ(d)|): the size that turns the measured visibility into
 *     |μ(d)| for a ladder of V0 (or the given V0), |2J1(v)/v| inverted on its first lobe
 *     (Born & Wolf §10.4.3) or exp(−2π²σ²d²/(λR)²) inverted;
 *   - two-beam: Gaussian envelope from the moving average's second moment (w = 2·rms).
 * Every candidate is ranked afterwards (rank.ts), so a wrong guess only costs one evaluation.
 * The wavelength-Gaussian broadband model is ranked through its wavenumber sibling (see
 * {@link rankingStandIn}).
 */
import { besselJ012 } from "../../physics/bessel.js";
import { modelSource } from "../../physics/modelSource.js";
import { getModel } from "../../physics/registry.js";
import type { PreparedFit } from "../preparedFit.js";
import { autoStartCandidates, fringeFrequency, linearFringeFit, movingAverage, resampleUniform, symmetryIndex } from "../autoStart.js";
import type { StartContext } from "./context.js";
import { hasInteriorGaps } from "./rank.js";

const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/** Far-field two-slit family and n-slit / single-slit candidates (see module comment). */
export function farFieldCandidates(ctx: StartContext): Record<string, number>[] {
  const { prep, has, known } = ctx;
  const { x, y } = prep;
  const distance = known("distance");
  const wavelength = has("wavelength") ? known("wavelength") : ctx.effectiveWavelength();
  const slits = has("slits") ? Math.max(1, Math.round(known("slits"))) : 2;
  const fringes = has("separation") && slits !== 1;
  // A gapped line (masked peaks) misleads the heuristic's own ranking of fringe frequencies:
  // keep every frequency's candidates for the ranking on the real points (rank.ts).
  const base = autoStartCandidates(x, y, wavelength, distance, false, hasInteriorGaps(prep) ? 24 : 8, fringes);
  const out: Record<string, number>[] = [];
  const sine = (u: number): number => u / Math.sqrt(u * u + distance * distance);
  for (const c of base) {
    if (has("slits") && slits >= 2) {
      for (const m of [1, 0.5, 2]) out.push({ center: c.center, separation: c.separation * m, width: c.width, amplitude: c.amplitude * slits, background: c.background });
    } else if (has("bandwidth")) {
      const edge = Math.max(Math.abs(sine(x[0] - c.center)), Math.abs(sine(x[x.length - 1] - c.center)));
      const path = c.separation * edge; // largest path difference in the window (m)
      for (const q of [0.05, 0.7, 1.2, 1.8]) {
        const sigmaK = q / Math.max(path, 1e-30);
        const bandwidth = (sigmaK * wavelength * wavelength * FWHM_PER_SIGMA) / (2 * Math.PI);
        const visibility = Math.min(0.98, Math.max(0.05, c.visibility / Math.exp(-0.5 * (q / 2) ** 2)));
        out.push({ ...c, bandwidth, visibility });
      }
    } else if (has("diameter") || has("rmsSize")) {
      out.push(...sourceSizeVariants(ctx, c, wavelength));
    } else {
      out.push(c);
    }
  }
  return out;
}

/**
 * The prepared fit to rank candidates on: for "two-slit-broadband-wavelength" the same fit with
 * its wavenumber sibling "two-slit-broadband" (same parameters and options; it maps the spectrum
 * to first order, so the two differ by about (σλ/λ0)² of the signal, 1e-4 at 15 nm around 590 nm,
 * far less than what sets candidates apart) and costs 1/20–1/40 as much per evaluation: ranking
 * the bandwidth ladder (4 rungs per heuristic start: 32 candidates, 96 on a gapped line) with
 * the model itself took 3/4 of a blind fit. Any other model, and a hand-built one whose options
 * are unknown, is ranked on itself. The candidates kept are then run on the model itself.
 */
export function rankingStandIn(prep: PreparedFit): PreparedFit {
  if (prep.model.id !== "two-slit-broadband-wavelength") return prep;
  const source = modelSource(prep.model);
  if (!source.rebuildable || source.id !== prep.model.id) return prep;
  const sibling = getModel("two-slit-broadband", source.options);
  const same = sibling.parameters.length === prep.model.parameters.length
    && sibling.parameters.every((spec, j) => spec.name === prep.model.parameters[j]!.name);
  return same ? { ...prep, model: sibling } : prep;
}

/** Source-size model starts: (V0, size) pairs that reproduce the measured two-slit visibility. */
function sourceSizeVariants(ctx: StartContext, c: Record<string, number>, wavelength: number): Record<string, number>[] {
  const { has, known, isFree } = ctx;
  const sizeName = has("diameter") ? "diameter" : "rmsSize";
  const R = known("sourceDistance");
  const d = c.separation;
  const measured = c.visibility;
  const out: Record<string, number>[] = [];
  const sizeFor = (mu: number): number => (sizeName === "diameter" ? discDiameterFor(mu, d, wavelength, R) : gaussianSizeFor(mu, d, wavelength, R));
  if (!isFree(sizeName)) {
    const mu = sizeName === "diameter" ? discCoherence((Math.PI * known(sizeName) * d) / (wavelength * R)) : Math.exp((-2 * (Math.PI * known(sizeName) * d) ** 2) / (wavelength * R) ** 2);
    out.push({ ...c, visibility: Math.min(0.99, measured / Math.max(mu, 1e-3)) });
    return out;
  }
  if (!isFree("visibility")) {
    const mu0 = Math.min(0.995, Math.max(0.01, measured / Math.max(known("visibility"), 1e-6)));
    for (const f of [1, 0.85, 1.15]) {
      const mu = Math.min(0.995, Math.max(0.01, mu0 * f));
      out.push({ ...c, [sizeName]: sizeFor(mu) });
    }
    return out;
  }
  for (const mu of [0.95, 0.8, 0.6, 0.4, 0.25]) {
    const v0 = measured / mu;
    if (v0 <= 1) out.push({ ...c, visibility: Math.min(0.99, v0), [sizeName]: sizeFor(mu) });
  }
  return out;
}

/** |2J1(v)/v| (Born & Wolf §10.4.3), dimensionless. */
export function discCoherence(v: number): number {
  if (Math.abs(v) < 1e-4) return 1 - (v * v) / 8;
  const t = { j0: 0, j1: 0, j2: 0 };
  besselJ012(v, t);
  return Math.abs((2 * t.j1) / v);
}

/** First zero of J1 (from memory; 3.8317059702…), where |2J1(v)/v| first vanishes. */
export const J1_FIRST_ZERO = 3.8317059702075123;

/** v on the first lobe (0 < v < 3.8317) with 2J1(v)/v = mu, by bisection (the lobe is decreasing). */
export function discArgumentFor(mu: number): number {
  let lo = 0, hi = J1_FIRST_ZERO;
  for (let it = 0; it < 60; it++) {
    const mid = 0.5 * (lo + hi);
    if (discCoherence(mid) > mu) lo = mid; else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Disc diameter D (m) with |μ(d)| = mu at separation d (m): v = πDd/(λR). */
export function discDiameterFor(mu: number, d: number, wavelength: number, sourceDistance: number): number {
  return (discArgumentFor(mu) * wavelength * sourceDistance) / (Math.PI * d);
}

/** Gaussian rms size σ (m) with exp(−2π²σ²d²/(λR)²) = mu at separation d (m). */
export function gaussianSizeFor(mu: number, d: number, wavelength: number, sourceDistance: number): number {
  return (wavelength * sourceDistance * Math.sqrt(-Math.log(mu) / 2)) / (Math.PI * d);
}

/** Two-beam (Gaussian envelope) candidates: see module comment. */
export function twoBeamCandidates(ctx: StartContext): Record<string, number>[] {
  const { prep, known } = ctx;
  const { x, y } = prep;
  const n = x.length;
  if (n < 16) return [];
  const wavelength = known("wavelength"), distance = known("distance");
  const dx = (x[n - 1] - x[0]) / (n - 1);
  if (!(dx > 0)) return [];
  const grid = resampleUniform(x, y, dx);
  const spectral = fringeFrequency(grid, dx);
  if (!spectral) return [];
  const period = Math.max(1, Math.round(1 / (spectral.frequency * dx)));
  const envelope = movingAverage(grid, period);
  const sorted = Float64Array.from(grid).sort();
  const floor = sorted[Math.floor(0.02 * (n - 1))];
  const ci = symmetryIndex(envelope, floor);
  const center = x[0] + ci * dx;
  let peak = 0;
  for (let i = 0; i < n; i++) peak = Math.max(peak, envelope[i] - floor);
  let sw = 0, su2 = 0;
  for (let i = 0; i < n; i++) {
    const e = envelope[i] - floor;
    if (e < 0.05 * peak) continue;
    const u = (i - ci) * dx;
    sw += e; su2 += e * u * u;
  }
  const waist0 = sw > 0 ? 2 * Math.sqrt(su2 / sw) : 0.25 * (x[n - 1] - x[0]);
  const sine = (u: number): number => u / Math.sqrt(u * u + distance * distance);
  const separation0 = spectral.frequency * wavelength * distance;
  const binStep = 0.25 / ((spectral.size * dx) / 4) / spectral.frequency;
  const out: Record<string, number>[] = [];
  for (const scale of [1, 0.8, 1.25]) {
    const w = waist0 * scale;
    for (const k of [0, -1, 1]) {
      const d = separation0 * (1 + k * binStep);
      const fit = linearFringeFit(grid, x[0], dx, center, d, 0, wavelength, sine, (u) => Math.exp((-2 * u * u) / (w * w)));
      if (fit) {
        const { width: _unused, ...start } = fit.start;
        out.push({ ...start, beamWaist: w });
      }
    }
  }
  return out;
}
