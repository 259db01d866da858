/**
 * Automatic starting values for far-field two-beam/two-slit models (parameters named amplitude,
 * center, separation, width, visibility, phase, background; wavelength and distance known):
 *   1. fringe spatial frequency ν from the peak of the Hann-windowed, zero-padded spectrum
 *      (parabolic interpolation), separation d = ν·λ·L; the next strongest local maxima well
 *      above the noise floor are tried too (an envelope's side lobes can outshine weak fringes);
 *   2. envelope = moving average over exactly one fringe period (removes the cosine);
 *   3. centre = point of best mirror symmetry of the envelope (peak of its self-convolution);
 *   4. slit width a from where the envelope falls to a fraction r of its peak: sinc²(πas/λ) = r;
 *   5. background, amplitude, visibility and phase by linear least squares of
 *      y ≈ b + A·E + B·E·cos θ + C·E·sin θ (E the sinc² envelope, θ = 2π d s/λ), for the
 *      frequency and four neighbours a quarter spectral bin apart; ranked by residual sum.
 * Returns a few candidate starts, best first; an empty list when the data show no fringes.
 * (fitProfile uses these through src/fit/starts, which covers every built-in model.)
 */
import type { Model } from "../physics/model.js";
import { fftInPlace, nextPowerOfTwo } from "./fft.js";

/** Names autoStart needs in a model. */
const REQUIRED = ["amplitude", "center", "background"];

/** True when {@link autoStartCandidates} knows the model's parameters. */
export function supportsAutoStart(model: Model): boolean {
  const names = model.parameters.map((p) => p.name);
  return REQUIRED.every((n) => names.includes(n)) && (names.includes("separation") || names.includes("width"))
    && names.includes("wavelength") && names.includes("distance");
}

/**
 * Candidate starting values (SI) for a two-slit-like model, best first.
 * @param x positions (m, increasing), y intensities, used points only
 * @param wavelength (m) and distance (m): the known geometry
 * @param smallAngle use s = (x − c)/L instead of the exact direction sine
 * @param fringes false for a single-slit (envelope only) model: steps 1 and 5's fringe terms are skipped
 */
export function autoStartCandidates(x: Float64Array, y: Float64Array, wavelength: number, distance: number, smallAngle = false, count = 3, fringes = true): Record<string, number>[] {
  const n = x.length;
  if (n < 16 || !(wavelength > 0) || !(distance > 0)) return [];
  const dx = (x[n - 1] - x[0]) / (n - 1);
  if (!(dx > 0)) return [];
  const grid = resampleUniform(x, y, dx);

  // 1. Fringe frequency from the spectrum (no fringes: a short smoothing window instead).
  if (!fringes) return startsAtFrequency(grid, x, dx, null, wavelength, distance, smallAngle, false).slice(0, count).map((r) => r.start);
  const frequencies = [...fringeFrequencyCandidates(grid, dx), ...fewFringeFrequencies(grid.length, dx)];
  // Each spectral candidate gives its own starts; the two best of each compete by residual sum.
  const results = frequencies.flatMap((f) => startsAtFrequency(grid, x, dx, f, wavelength, distance, smallAngle, true).slice(0, 2));
  results.sort((p, q) => p.rss - q.rss);
  return results.slice(0, count).map((r) => r.start);
}

/** Steps 2–5 of {@link autoStartCandidates} for one fringe frequency (null: no fringes), best first. */
function startsAtFrequency(grid: Float64Array, x: Float64Array, dx: number, spectral: { frequency: number; size: number } | null,
  wavelength: number, distance: number, smallAngle: boolean, fringes: boolean): { rss: number; start: Record<string, number> }[] {
  const n = grid.length;
  const frequency = spectral ? spectral.frequency : 0;
  const size = spectral ? spectral.size : 0;
  const separation = frequency * wavelength * distance;

  // 2. Envelope by a one-period moving average.
  const period = fringes ? Math.max(1, Math.round(1 / (frequency * dx))) : Math.max(1, Math.round(n / 64));
  const envelope = movingAverage(grid, period);
  const sorted = Float64Array.from(grid).sort();
  const background0 = sorted[Math.floor(0.02 * (n - 1))];

  // 3. Centre from mirror symmetry: peak of the self-convolution of (envelope − background).
  const centerIndex = symmetryIndex(envelope, background0);
  const center = x[0] + centerIndex * dx;

  // 4. Width from the envelope's fall-off, relative to a background level.
  const ci = Math.min(n - 1, Math.max(0, Math.round(centerIndex)));
  const sine = (u: number): number => (smallAngle ? u / distance : u / Math.sqrt(u * u + distance * distance));
  const span = Math.max(Math.abs(sine(x[0] - center)), Math.abs(sine(x[n - 1] - center)));
  const widthFor = (background: number): number => {
    const top = envelope[ci] - background;
    const widths: number[] = [];
    if (top > 0) {
      for (let i = 0; i < n; i += Math.max(1, Math.floor(period / 2))) {
        const ratio = (envelope[i] - background) / top;
        const s = Math.abs(sine(x[0] + i * dx - center));
        if (ratio > 0.15 && ratio < 0.85 && s > 0) widths.push((sincSquaredInverse(ratio) * wavelength) / (Math.PI * s));
      }
    }
    widths.sort((p, q) => p - q);
    // No fall-off seen: the envelope is wider than the window; start with its first null at twice the half-span.
    return widths.length > 0 ? widths[Math.floor(widths.length / 2)] : wavelength / (2 * span);
  };
  // The 2nd-percentile level overestimates the background when the envelope fills the window:
  // one refinement with the background of a linear fit at the first width.
  let width = widthFor(background0);
  const firstPass = fringes
    ? linearFringeFit(grid, x[0], dx, center, separation, width, wavelength, sine)
    : linearEnvelopeFit(grid, x[0], dx, center, width, wavelength, sine);
  if (firstPass) width = widthFor(Math.min(firstPass.start.background, background0));
  if (!fringes) {
    const fit = linearEnvelopeFit(grid, x[0], dx, center, width, wavelength, sine);
    return fit ? [fit] : [];
  }

  // 5. Linear least squares for background, amplitude, visibility, phase at neighbouring frequencies.
  const binStep = 0.25 / (size * dx / 4) / frequency; // a quarter of an unpadded bin, relative
  const results: { rss: number; start: Record<string, number> }[] = [];
  for (const k of [0, -1, 1, -2, 2]) {
    const d = separation * (1 + k * binStep);
    const fit = linearFringeFit(grid, x[0], dx, center, d, width, wavelength, sine);
    if (fit) results.push(fit);
  }
  results.sort((p, q) => p.rss - q.rss);
  return results;
}

/**
 * Grid index (fractional, half steps) of best mirror symmetry of max(v − floor, 0): the peak of
 * its self-convolution (a symmetric pattern about c convolved with itself peaks at 2c).
 */
export function symmetryIndex(values: Float64Array, floor: number): number {
  const n = values.length;
  const conv = nextPowerOfTwo(2 * n);
  const er = new Float64Array(conv), ei = new Float64Array(conv);
  for (let i = 0; i < n; i++) er[i] = Math.max(values[i] - floor, 0);
  fftInPlace(er, ei);
  for (let k = 0; k < conv; k++) {
    const r = er[k], i = ei[k];
    er[k] = r * r - i * i; ei[k] = 2 * r * i;
  }
  fftInPlace(er, ei, true);
  let best = 0;
  for (let m = 1; m < 2 * n - 1; m++) if (er[m] > er[best]) best = m;
  return best / 2;
}

/**
 * Candidate fringe frequencies (cycles/m), most likely first: the spectral peak of
 * {@link fringeFrequency}, then the next strongest local maxima of |F| beyond the envelope's lobe
 * (at least two unpadded bins apart). An envelope with several side lobes in the window (narrow
 * slits) can outshine weak fringes in |F|, so the fringe peak may be the second or third maximum;
 * the caller tells them apart by fitting each.
 */
export function fringeFrequencyCandidates(grid: Float64Array, dx: number, count = 4): { frequency: number; size: number }[] {
  const first = fringeFrequency(grid, dx);
  const out: { frequency: number; size: number }[] = first ? [first] : [];
  for (let rank = 1; out.length < count && rank <= 3 * count; rank++) {
    const more = fringeFrequency(grid, dx, rank);
    if (!more) break;
    if (out.every((f) => Math.abs(f.frequency - more.frequency) * more.size * dx > 8)) out.push(more);
  }
  return out;
}

/**
 * Frequencies of 2 to 4 fringe periods across the window (cycles/m). With so few fringes the
 * fringe peak of the spectrum merges with the envelope's low-frequency lobe and the spectral
 * search misses it; these candidates cost only a linear fit each and are ranked with the rest.
 * (Fewer than two periods cannot be told from the envelope: fitChecks calls such a fit fringe-free.)
 */
function fewFringeFrequencies(n: number, dx: number): { frequency: number; size: number }[] {
  const size = nextPowerOfTwo(n) * 4;
  return [2, 2.5, 3, 4].map((cycles) => ({ frequency: cycles / (n * dx), size }));
}

/** Fringe spatial frequency (cycles/m) from the Hann-windowed, 4× zero-padded spectrum (rank > 0: the rank-th strongest local maximum, 0 the strongest); null when no peak. */
export function fringeFrequency(grid: Float64Array, dx: number, rank = 0): { frequency: number; size: number } | null {
  const n = grid.length;
  const size = nextPowerOfTwo(n) * 4;
  const re = new Float64Array(size), im = new Float64Array(size);
  let mean = 0;
  for (let i = 0; i < n; i++) mean += grid[i];
  mean /= n;
  for (let i = 0; i < n; i++) re[i] = (grid[i] - mean) * (0.5 - 0.5 * Math.cos((2 * Math.PI * i) / (n - 1)));
  fftInPlace(re, im);
  const half = size / 2;
  const power = new Float64Array(half);
  for (let k = 0; k < half; k++) power[k] = Math.hypot(re[k], im[k]);
  // End of the envelope's low-frequency lobe, walked at the unpadded resolution (4 padded bins)
  // so the interpolation ripples of zero padding do not stop the walk early.
  // (Subtracting the mean can leave a dip at k = 0: climb the lobe first, then walk down it.)
  let k0 = 0;
  while (k0 + 4 < half - 1 && power[k0 + 4] >= power[k0] && k0 < 8) k0 += 4;
  while (k0 + 4 < half - 1 && power[k0 + 4] < power[k0]) k0 += 4;
  let peak = -1;
  if (rank > 0) {
    // The rank-th strongest local maximum (padded bins, above its two neighbours on each side).
    const maxima: number[] = [];
    for (let k = k0 + 2; k < half - 2; k++) {
      if (power[k] > power[k - 1] && power[k] >= power[k + 1] && power[k] > power[k - 2] && power[k] >= power[k + 2]) maxima.push(k);
    }
    maxima.sort((p, q) => power[q] - power[p]);
    if (rank >= maxima.length) return null;
    peak = maxima[rank];
    // Only peaks well above the noise floor (median |F| over the upper half of the band, where
    // the noise dominates; the largest of thousands of noise bins is about 3.5× that median).
    const upper = Array.from(power.subarray(half >> 1, half)).sort((p, q) => p - q);
    if (!(power[peak] > 8 * upper[upper.length >> 1])) return null;
  } else {
    for (let k = k0 + 1; k < half - 1; k++) if (peak < 0 || power[k] > power[peak]) peak = k;
  }
  if (peak <= 0 || !(power[peak] > power[peak - 1] && power[peak] >= power[peak + 1])) return null;
  const [a0, b0, c0] = [Math.log(power[peak - 1] + 1e-300), Math.log(power[peak] + 1e-300), Math.log(power[peak + 1] + 1e-300)];
  const denominator = a0 - 2 * b0 + c0;
  const shift = denominator < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a0 - c0)) / denominator)) : 0;
  const frequency = (peak + shift) / (size * dx); // cycles per metre of detector

  return { frequency, size };
}

/** Background and amplitude by linear least squares of y ≈ b + A·sinc²(π a s/λ) (no fringes). */
function linearEnvelopeFit(y: Float64Array, x0: number, dx: number, center: number, width: number,
  wavelength: number, sine: (u: number) => number): { rss: number; start: Record<string, number> } | null {
  const n = y.length;
  let s11 = 0, s1e = 0, see = 0, sy = 0, sey = 0;
  for (let i = 0; i < n; i++) {
    const beta = (Math.PI * width * sine(x0 + i * dx - center)) / wavelength;
    const e = beta === 0 ? 1 : (Math.sin(beta) / beta) ** 2;
    s11 += 1; s1e += e; see += e * e; sy += y[i]; sey += e * y[i];
  }
  const det = s11 * see - s1e * s1e;
  if (!(Math.abs(det) > 0)) return null;
  const background = (see * sy - s1e * sey) / det, amplitude = (s11 * sey - s1e * sy) / det;
  if (!(amplitude > 0)) return null;
  let lowest = Infinity;
  for (let i = 0; i < n; i++) lowest = Math.min(lowest, y[i]);
  const floor = Math.max(1e-3 * amplitude, lowest > 0 ? 0.5 * lowest : 0);
  return { rss: 0, start: { amplitude, background: Math.max(background, floor), center, width } };
}

/** Solves sinc²(β) = r for β in (0, π) by bisection (sinc² is decreasing there). */
export function sincSquaredInverse(r: number): number {
  let lo = 0, hi = Math.PI;
  for (let it = 0; it < 60; it++) {
    const mid = 0.5 * (lo + hi);
    const s = Math.sin(mid) / mid;
    if (s * s > r) lo = mid; else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** y resampled on the uniform grid x[0] + i·dx (linear interpolation), same length. */
export function resampleUniform(x: Float64Array, y: Float64Array, dx: number): Float64Array {
  const n = x.length;
  const out = new Float64Array(n);
  let j = 0;
  for (let i = 0; i < n; i++) {
    const xi = x[0] + i * dx;
    while (j < n - 2 && x[j + 1] < xi) j++;
    const t = x[j + 1] === x[j] ? 0 : (xi - x[j]) / (x[j + 1] - x[j]);
    out[i] = y[j] + Math.max(0, Math.min(1, t)) * (y[j + 1] - y[j]);
  }
  return out;
}

/** Moving average over `width` samples (shrinking at the ends). */
export function movingAverage(y: Float64Array, width: number): Float64Array {
  const n = y.length;
  const prefix = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) prefix[i + 1] = prefix[i] + y[i];
  const out = new Float64Array(n);
  const halfLow = Math.floor((width - 1) / 2), halfHigh = width - 1 - halfLow;
  for (let i = 0; i < n; i++) {
    const lo = Math.max(0, i - halfLow), hi = Math.min(n - 1, i + halfHigh);
    out[i] = (prefix[hi + 1] - prefix[lo]) / (hi - lo + 1);
  }
  return out;
}

/**
 * Background, amplitude, visibility and phase by linear least squares of
 * y ≈ b + E·(A + B cos θ + C sin θ), θ = 2π d s/λ, on the uniform grid x0 + i·dx; E is the sinc²
 * envelope of slit width `width`, or `envelopeAt(u)` (u = x − center) when given.
 */
export function linearFringeFit(y: Float64Array, x0: number, dx: number, center: number, separation: number, width: number,
  wavelength: number, sine: (u: number) => number, envelopeAt?: (u: number) => number): { rss: number; start: Record<string, number> } | null {
  const n = y.length;
  const ata = new Float64Array(16), aty = new Float64Array(4), row = new Float64Array(4);
  let lowest = Infinity;
  for (let i = 0; i < n; i++) lowest = Math.min(lowest, y[i]);
  for (let i = 0; i < n; i++) {
    const s = sine(x0 + i * dx - center);
    const beta = (Math.PI * width * s) / wavelength;
    const envelope = envelopeAt ? envelopeAt(x0 + i * dx - center) : beta === 0 ? 1 : (Math.sin(beta) / beta) ** 2;
    const theta = (2 * Math.PI * separation * s) / wavelength;
    row[0] = 1; row[1] = envelope; row[2] = envelope * Math.cos(theta); row[3] = envelope * Math.sin(theta);
    for (let a = 0; a < 4; a++) {
      aty[a] += row[a] * y[i];
      for (let b = 0; b < 4; b++) ata[a * 4 + b] += row[a] * row[b];
    }
  }
  const coef = solve4(ata, aty);
  if (!coef) return null;
  const [background, amplitude, b, c] = coef;
  if (!(amplitude > 0)) return null;
  let rss = 0;
  for (let i = 0; i < n; i++) {
    const s = sine(x0 + i * dx - center);
    const beta = (Math.PI * width * s) / wavelength;
    const envelope = envelopeAt ? envelopeAt(x0 + i * dx - center) : beta === 0 ? 1 : (Math.sin(beta) / beta) ** 2;
    const theta = (2 * Math.PI * separation * s) / wavelength;
    const f = background + envelope * (amplitude + b * Math.cos(theta) + c * Math.sin(theta));
    rss += (y[i] - f) ** 2;
  }
  const visibility = Math.min(0.99, Math.max(0.02, Math.hypot(b, c) / amplitude));
  // Keep the start's intensity positive everywhere (the Poisson deviance needs f > 0).
  const floor = Math.max(1e-3 * amplitude, lowest > 0 ? 0.5 * lowest : 0);
  return { rss, start: { amplitude, background: Math.max(background, floor), center, separation, width, visibility, phase: Math.atan2(-c, b) } };
}

/** Gaussian elimination with partial pivoting on a 4 × 4 system (copies its inputs). */
function solve4(matrix: Float64Array, rhs: Float64Array): number[] | null {
  const a = Array.from({ length: 4 }, (_, i) => [matrix[i * 4], matrix[i * 4 + 1], matrix[i * 4 + 2], matrix[i * 4 + 3], rhs[i]]);
  for (let col = 0; col < 4; col++) {
    let pivot = col;
    for (let r = col + 1; r < 4; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r;
    if (!(Math.abs(a[pivot][col]) > 1e-300)) return null;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    for (let r = col + 1; r < 4; r++) {
      const f = a[r][col] / a[col][col];
      for (let k = col; k < 5; k++) a[r][k] -= f * a[col][k];
    }
  }
  const out = [0, 0, 0, 0];
  for (let r = 3; r >= 0; r--) {
    let s = a[r][4];
    for (let k = r + 1; k < 4; k++) s -= a[r][k] * out[k];
    out[r] = s / a[r][r];
  }
  return out.every(Number.isFinite) ? out : null;
}
