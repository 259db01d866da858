// B6 of ../shared/bench/PROBLEMS.md: blind starts over every built-in model.
// Run: npm run bench -- B6 [--count 40] [--models two-slit,n-slit-3,...]
//
// For each model id `fringekit models` lists (n-slit with N = 3, 4 and 5 as separate entries),
// `count` seeded profiles (default 40) with truths drawn uniformly from the ranges below; each is
// fitted with only what a user knows (wavelength, distance, slit count, pixel width, source
// distance; the spectrum table for two-slit-spectrum) and no starting values, and once more
// started at the truth. Success: converged, objective no worse than the truth-started fit
// (relative 1e-6), and every free parameter within 4 reported standard uncertainties of its truth.
//
// Truth ranges (uniform draws):
//   Far-field line models (two-slit, single-slit, n-slit, two-beam, two-slit-broadband,
//   two-slit-spectrum, two-slit-disc-source, two-slit-gaussian-source):
//     2048–4096 pixels of 3–10 µm (pixelWidth = pitch, known), Poisson counts; wavelength
//     450–700 nm, distance 0.3–2 m; peak 200–20000 counts, background 0.5–5 % of the peak + 2;
//     centre within ±10 % of the window around its middle; separation 0.1–1.5 mm, slit width
//     from separation/width 2.5–8; visibility 0.3–0.95, phase (−π, π]. Draws whose fringe
//     period λL/d is below 6 pixels or shows fewer than 8 fringes in the window are redrawn.
//     single-slit: width 0.02–0.3 mm, redrawn unless the envelope's first zero λL/a lies
//       30 pixels to half a window from the centre.
//     two-beam: beam waist 0.15–0.4 of the window.
//     two-slit-broadband and two-slit-broadband-wavelength: bandwidth (FWHM) 2–15 nm, redrawn when the damping argument
//       q = σk·d·s at the window's edge exceeds 3 (fringes gone over most of the window).
//     two-slit-spectrum: a Gaussian-shaped table (31 samples over ±1.5 FWHM) of FWHM 2–15 nm,
//       redrawn as for broadband.
//     source models: V0 = 1 (fixed: one profile cannot tell V0 from the size), sourceDistance
//       0.2–2 m (known), |μ(d)| 0.2–0.95 on the first lobe, which sets diameter / rmsSize.
//   Near field (two-slit-fresnel, 2 slits): Fresnel number a²/(λL) 0.5–5, distance 0.05–0.5 m,
//     wavelength 450–700 nm (so a = √(F λ L), 0.1–1.3 mm), separation/width 1.5–4; pixels and
//     pitch as above with the pattern (d + a + 6√(λL)) at most 60 % of the window and the fringe
//     period λL/d at least 4 pixels (redrawn otherwise); illumination 200–10000 counts.
//   Coherence scans (coherence-disc, coherence-gaussian): 6–12 separations evenly spaced up to
//     d_max = 1.1–2 × the half-visibility separation d_half (0.5–5 mm); V0 0.7–1, wavelength
//     450–700 nm, source distance 0.3–3 m (known); gaussian noise σ 0.5–2 % in visibility
//     (σ given, absolute).
import { loadavg } from "node:os";
import { fitProfile } from "../src/fit/fitProfile.js";
import type { FitOptions, FitResult } from "../src/fit/types.js";
import { discDiameterFor, gaussianSizeFor } from "../src/fit/starts/farField.js";
import { getModel, listModels, pixelPositions, simulateProfile } from "../src/physics/index.js";
import type { Model } from "../src/physics/model.js";
import type { Profile } from "../src/profile.js";
import { createRandom } from "../src/random.js";

/** One B6 problem: model, profile, what the user knows, and the truth. */
export interface B6Case {
  label: string;
  model: Model;
  profile: Profile;
  fix: Record<string, number>;
  truth: Record<string, number>;
  options?: Partial<FitOptions>;
}

type Uniform = (lo: number, hi: number) => number;

/** The B6 labels: every registered model id, n-slit split into N = 3, 4, 5. */
export function b6Labels(): string[] {
  return listModels().flatMap((m) => (m.id === "n-slit" ? ["n-slit-3", "n-slit-4", "n-slit-5"] : [m.id]));
}

/** Builds case `k` of `label` from its own seeded stream. */
export function b6Case(label: string, k: number): B6Case {
  const seed = 6000 + 1000 * b6Labels().indexOf(label) + k;
  const rng = createRandom(seed);
  const u: Uniform = (lo, hi) => lo + (hi - lo) * rng.uniform();
  if (label === "coherence-disc" || label === "coherence-gaussian") return coherenceCase(label, u, seed);
  if (label === "two-slit-fresnel") return nearFieldCase(u, seed);
  return farFieldCase(label, u, seed);
}

function farFieldCase(label: string, u: Uniform, seed: number): B6Case {
  for (;;) {
    const c = farFieldDraw(label, u, seed);
    if (c) return c;
  }
}

/** One draw of a far-field case, or null when the geometry falls outside the accepted region. */
function farFieldDraw(label: string, u: Uniform, seed: number): B6Case | null {
  const pixels = Math.round(u(2048, 4096)), pitch = u(3e-6, 10e-6);
  const wavelength = u(450e-9, 700e-9), distance = u(0.3, 2);
  const window = pixels * pitch;
  const amplitude = u(200, 20000);
  const background = amplitude * u(0.005, 0.05) + 2;
  const center = u(-0.1, 0.1) * window;
  const separation = u(0.1e-3, 1.5e-3);
  const visibility = u(0.3, 0.95), phase = u(-Math.PI, Math.PI);
  const ratio = u(2.5, 8);
  const period = (wavelength * distance) / separation;
  const needsFringes = label !== "single-slit";
  if (needsFringes && (period < 6 * pitch || period > window / 8)) return null;
  const fix: Record<string, number> = { wavelength, distance, pixelWidth: pitch };
  let truth: Record<string, number> = { amplitude, background, center, phase, visibility };
  let modelId = label;
  let modelOptions: Record<string, unknown> = {};
  let fwhm = 0;
  const broadband = label === "two-slit-broadband" || label === "two-slit-broadband-wavelength";
  if (broadband || label === "two-slit-spectrum") {
    fwhm = u(2e-9, 15e-9);
    // Damping argument at the window's edge: q = σk·d·s, σk = 2πΔλ/(λ²·2.3548).
    const q = ((2 * Math.PI * fwhm) / (wavelength * wavelength * 2 * Math.sqrt(2 * Math.LN2))) * separation * (0.5 * window / distance);
    if (q > 3) return null;
  }
  if (label.startsWith("n-slit-")) {
    modelId = "n-slit";
    fix.slits = Number(label.slice("n-slit-".length));
    truth = { amplitude, background, center, separation, width: separation / ratio };
  } else if (label === "single-slit") {
    const width = u(0.02e-3, 0.3e-3);
    const zero = (wavelength * distance) / width;
    if (zero < 30 * pitch || zero > window / 2) return null;
    truth = { amplitude, background, center, width };
  } else if (label === "two-beam") {
    truth = { ...truth, separation, beamWaist: u(0.15, 0.4) * window };
  } else if (broadband) {
    truth = { ...truth, separation, width: separation / ratio, bandwidth: fwhm };
  } else if (label === "two-slit-spectrum") {
    delete fix.wavelength;
    const sigma = fwhm / (2 * Math.sqrt(2 * Math.LN2));
    const wavelengths = Array.from({ length: 31 }, (_, i) => wavelength + ((i - 15) / 10) * fwhm);
    const weights = wavelengths.map((l) => Math.exp(-0.5 * ((l - wavelength) / sigma) ** 2));
    modelOptions = { spectrum: { wavelengths, weights } };
    truth = { ...truth, separation, width: separation / ratio };
  } else if (label === "two-slit-disc-source" || label === "two-slit-gaussian-source") {
    const sourceDistance = u(0.2, 2), mu = u(0.2, 0.95);
    fix.sourceDistance = sourceDistance;
    fix.visibility = 1;
    truth = { amplitude, background, center, phase, separation, width: separation / ratio };
    if (label === "two-slit-disc-source") truth.diameter = discDiameterFor(mu, separation, wavelength, sourceDistance);
    else truth.rmsSize = gaussianSizeFor(mu, separation, wavelength, sourceDistance);
  } else {
    truth = { ...truth, separation, width: separation / ratio };
  }
  const model = getModel(modelId, modelOptions);
  const x = pixelPositions(pixels, pitch);
  const profile = simulateProfile(model, { ...truth, ...fix }, x, { noise: "poisson", seed });
  return { label, model, profile, fix, truth };
}

function nearFieldCase(u: Uniform, seed: number): B6Case {
  for (;;) {
    const fresnel = u(0.5, 5), distance = u(0.05, 0.5), wavelength = u(450e-9, 700e-9);
    const width = Math.sqrt(fresnel * wavelength * distance), separation = width * u(1.5, 4);
    const pixels = Math.round(u(2048, 4096)), pitch = u(3e-6, 10e-6);
    const extent = separation + width + 6 * Math.sqrt(wavelength * distance);
    const period = (wavelength * distance) / separation;
    if (extent > 0.6 * pixels * pitch || period < 4 * pitch) continue;
    const amplitude = u(200, 10000), background = amplitude * u(0.005, 0.05) + 2;
    const center = u(-0.1, 0.1) * pixels * pitch;
    const model = getModel("two-slit-fresnel");
    // The slit count is known to whoever built the slits: fixed, as for the n-slit cases.
    const fix = { wavelength, distance, pixelWidth: pitch, slits: 2 };
    const truth = { amplitude, background, center, separation, width };
    const profile = simulateProfile(model, { ...truth, ...fix }, pixelPositions(pixels, pitch), { noise: "poisson", seed });
    return { label: "two-slit-fresnel", model, profile, fix, truth };
  }
}

function coherenceCase(label: string, u: Uniform, seed: number): B6Case {
  const model = getModel(label);
  const wavelength = u(450e-9, 700e-9), sourceDistance = u(0.3, 3);
  const dHalf = u(0.5e-3, 5e-3), reach = u(1.1, 2), count = Math.round(u(6, 12)), sigma = u(0.005, 0.02);
  const visibility = u(0.7, 1);
  const sizeName = label === "coherence-disc" ? "diameter" : "rmsSize";
  const size = label === "coherence-disc" ? discDiameterFor(0.5, dHalf, wavelength, sourceDistance) : gaussianSizeFor(0.5, dHalf, wavelength, sourceDistance);
  const x = Float64Array.from({ length: count }, (_, i) => ((i + 1) / count) * reach * dHalf);
  const fix = { wavelength, sourceDistance };
  const truth = { visibility, [sizeName]: size };
  const profile = simulateProfile(model, { ...truth, ...fix }, x, { noise: "gaussian", sigma, seed });
  return { label, model, profile, fix, truth, options: { sigmaAbsolute: true } };
}

/** Fits one case blind and from the truth; success as in the module comment. */
export function runB6Case(c: B6Case): { success: boolean; ms: number; detail: string; auto: FitResult } {
  const t0 = performance.now();
  const auto = fitProfile(c.profile, c.model, { ...c.options, fix: c.fix });
  const ms = performance.now() - t0;
  const reference = fitProfile(c.profile, c.model, { ...c.options, fix: c.fix, start: c.truth });
  const a = auto.statistics.objective, r = reference.statistics.objective;
  const objectiveOk = a <= r + 1e-6 * Math.abs(r);
  const off: string[] = [];
  for (const p of auto.parameters) {
    if (p.fixed || c.truth[p.name] === undefined) continue;
    let diff = p.value - c.truth[p.name];
    if (p.name === "phase") diff -= 2 * Math.PI * Math.round(diff / (2 * Math.PI));
    if (!(Math.abs(diff) <= 4 * p.uncertainty)) off.push(`${p.name} ${p.value.toPrecision(5)} vs ${c.truth[p.name].toPrecision(5)} (±${p.uncertainty.toPrecision(2)})`);
  }
  const success = auto.converged && objectiveOk && off.length === 0;
  const starts = auto.starts ? `${auto.starts.agreeing}/${auto.starts.converged}/${auto.starts.tried}` : "-";
  const detail = `${auto.converged ? "converged" : auto.reason}, objective ${a.toFixed(2)} vs ${r.toFixed(2)} from truth, starts ${starts}${off.length ? `; off: ${off.join(", ")}` : ""}`;
  return { success, ms, detail, auto };
}

function option(name: string): string | undefined {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? process.argv[i + 1] : undefined;
}

export async function main(): Promise<void> {
  const count = Number(option("count") ?? 40);
  if (!(Number.isInteger(count) && count > 0)) throw new Error(`B6: --count must be a positive integer (got ${option("count")})`);
  const labels = option("models")?.split(",") ?? b6Labels();
  const t0 = performance.now();
  let total = 0, successes = 0;
  let worst = { label: "", rate: Infinity };
  for (const label of labels) {
    if (!b6Labels().includes(label)) throw new Error(`B6: unknown model ${label}; one of ${b6Labels().join(", ")}`);
    let ok = 0;
    const times: number[] = [];
    for (let k = 0; k < count; k++) {
      const c = b6Case(label, k);
      const outcome = runB6Case(c);
      times.push(outcome.ms);
      if (outcome.success) ok++;
      else process.stdout.write(`miss ${label} #${k}: ${outcome.detail}\n`);
    }
    times.sort((a, b) => a - b);
    const rate = (100 * ok) / count;
    process.stdout.write(`${label.padEnd(26)} ${rate.toFixed(1).padStart(5)}% (${ok}/${count}), median ${times[Math.floor(count / 2)].toFixed(0)} ms per blind fit  [load ${loadAverage()}]\n`);
    total += count; successes += ok;
    if (rate < worst.rate) worst = { label, rate };
  }
  process.stdout.write(`B6 run time ${((performance.now() - t0) / 1000).toFixed(0)} s (load average ${loadavg()[0].toFixed(2)} at the end)\n`);
  process.stdout.write(`B6 blind-start success ${((100 * successes) / total).toFixed(1)}% (${successes}/${total}); worst model ${worst.label} ${worst.rate.toFixed(1)}%\n`);
}

function loadAverage(): string {
  return loadavg()[0].toFixed(2);
}
