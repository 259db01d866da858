/**
 * A small deterministic space-filling design for models without a physical start heuristic
 * (formula models): Halton points (radical inverses in the first primes; Halton 1960,
 * Numerische Mathematik 2:84) over every free parameter with finite lower and upper bounds,
 * on a logarithmic scale when both bounds are positive and span more than three decades.
 * Parameters without finite bounds keep their given start or default. 8 + 4·q points
 * (q bounded parameters), at most 32, plus the defaults themselves; all ranked by the objective.
 */
import type { StartContext } from "./context.js";

const PRIMES = [2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41, 43, 47, 53];

/** Radical inverse of k in base b (van der Corput), in [0, 1). */
export function radicalInverse(k: number, base: number): number {
  let result = 0, f = 1 / base;
  for (let i = k; i > 0; i = Math.floor(i / base)) {
    result += f * (i % base);
    f /= base;
  }
  return result;
}

/** Names of the free, not-given parameters with finite bounds on both sides. */
export function boundedFree(ctx: StartContext): { name: string; lower: number; upper: number }[] {
  const { plan, options } = ctx.prep;
  const out: { name: string; lower: number; upper: number }[] = [];
  plan.free.forEach((j, k) => {
    const name = plan.names[j];
    if (options.start?.[name] !== undefined) return;
    if (Number.isFinite(plan.lower[k]) && Number.isFinite(plan.upper[k]) && plan.upper[k] > plan.lower[k]) out.push({ name, lower: plan.lower[k], upper: plan.upper[k] });
  });
  return out;
}

/** The design's candidate starts (see module comment); empty when no free parameter is bounded. */
export function designCandidates(ctx: StartContext): Record<string, number>[] {
  const bounded = boundedFree(ctx).slice(0, PRIMES.length);
  if (bounded.length === 0) return [];
  const count = Math.min(32, 8 + 4 * bounded.length);
  const out: Record<string, number>[] = [{}];
  for (let k = 1; k <= count; k++) {
    const point: Record<string, number> = {};
    bounded.forEach((b, i) => {
      // Halton points at k + 1 skip the corner-hugging first points of the higher bases.
      const u = radicalInverse(k + 1, PRIMES[i]);
      const logScale = b.lower > 0 && b.upper / b.lower > 1e3;
      point[b.name] = logScale ? b.lower * Math.pow(b.upper / b.lower, u) : b.lower + u * (b.upper - b.lower);
    });
    out.push(point);
  }
  return out;
}
