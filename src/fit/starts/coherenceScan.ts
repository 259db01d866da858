/**
 * Candidate starts for coherence scans (visibility against slit separation d):
 *   - the separation where the visibility falls to half its largest value, interpolated
 *     between samples, gives the size: |2J1(v)/v| = 1/2 at v ≈ 2.2152 for a uniform disc
 *     (Born & Wolf §10.4.3), exp(−2π²σ²d²/(λR)²) = 1/2 for a Gaussian source;
 *   - a first zero of the disc's |2J1(v)/v| (v = 3.8317) at the deepest sample before the
 *     visibility rises again;
 *   - and, since a scan may not reach half visibility or may run past the first zero, a
 *     logarithmic ladder of sizes whose argument at the largest separation spans 0.3–14
 *     (disc) or whose exponent there spans 0.01–8 (Gaussian).
 * V0 (`visibility`) is then fitted linearly for each size (rank.ts); the best few are kept.
 */
import type { StartContext } from "./context.js";
import { discDiameterFor, gaussianSizeFor, J1_FIRST_ZERO } from "./farField.js";

/** Coherence-scan candidates (see module comment). */
export function coherenceScanCandidates(ctx: StartContext): Record<string, number>[] {
  const { prep, has, known, isFree } = ctx;
  const sizeName = has("diameter") ? "diameter" : "rmsSize";
  const wavelength = known("wavelength"), R = known("sourceDistance");
  if (!isFree(sizeName)) return [{}];
  const order = Array.from(prep.x.keys()).filter((i) => prep.x[i] > 0).sort((a, b) => prep.x[a] - prep.x[b]);
  if (order.length < 2) return [];
  const d = order.map((i) => prep.x[i]), v = order.map((i) => prep.y[i]);
  const dMax = d[d.length - 1];
  const out: Record<string, number>[] = [];
  const push = (size: number): void => { if (Number.isFinite(size) && size > 0) out.push({ [sizeName]: size, visibility: 0.9 }); };
  const peak = Math.max(...v.slice(0, Math.max(2, Math.ceil(v.length / 3))));
  for (let i = 1; i < d.length; i++) {
    if (v[i] < 0.5 * peak && v[i - 1] >= 0.5 * peak) {
      const t = (v[i - 1] - 0.5 * peak) / (v[i - 1] - v[i]);
      const dHalf = d[i - 1] + t * (d[i] - d[i - 1]);
      push(sizeName === "diameter" ? discDiameterFor(0.5, dHalf, wavelength, R) : gaussianSizeFor(0.5, dHalf, wavelength, R));
      break;
    }
  }
  if (sizeName === "diameter") {
    let deepest = 0;
    for (let i = 1; i < d.length; i++) if (v[i] < v[deepest]) deepest = i;
    if (deepest > 0 && deepest < d.length - 1 && v[deepest + 1] > v[deepest]) push((J1_FIRST_ZERO * wavelength * R) / (Math.PI * d[deepest]));
  }
  const steps = 28;
  for (let k = 0; k < steps; k++) {
    const t = k / (steps - 1);
    if (sizeName === "diameter") {
      const arg = 0.3 * Math.pow(14 / 0.3, t);
      push((arg * wavelength * R) / (Math.PI * dMax));
    } else {
      const exponent = 0.01 * Math.pow(8 / 0.01, t);
      push((wavelength * R * Math.sqrt(exponent / 2)) / (Math.PI * dMax));
    }
  }
  return out;
}
