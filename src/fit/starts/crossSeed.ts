/**
 * Fits for a model comparison: every candidate model is fitted to the same profile from its own
 * automatic starts, then again with the other candidates' fitted geometry tried first (near field
 * seeded from the far-field fit and back). A model must not lose a comparison because its own
 * starts missed an optimum that another model's fit points to. The seeded refit is kept only when
 * it reaches a lower objective (by more than the global stage's tolerance).
 */
import type { Model } from "../../physics/model.js";
import type { Profile } from "../../profile.js";
import { fitProfile, fitWithStarts } from "../fitProfile.js";
import type { FitOptions, FitResult } from "../types.js";

/** Parameters whose meaning is shared between models and so can seed another model's fit. */
export const SHARED_GEOMETRY = ["center", "separation", "width", "visibility", "phase", "beamWaist", "bandwidth", "diameter", "rmsSize"] as const;

/** One candidate of a comparison: a model and its fit options. */
export interface ComparisonCandidate {
  model: Model;
  options?: FitOptions;
}

/**
 * Fits each candidate, then refits each from the others' fitted geometry (see module comment).
 * Units: SI; amplitude and background are refitted linearly for each seed, so their model-specific
 * meaning does not matter. Cost: about twice the plain fits.
 * @example const [far, near] = fitCandidates(profile, [{ model: getModel("two-slit"), options }, { model: getModel("two-slit-fresnel"), options }])
 */
export function fitCandidates(profile: Profile, candidates: readonly ComparisonCandidate[]): FitResult[] {
  const first = candidates.map((c) => fitProfile(profile, c.model, c.options ?? {}));
  return candidates.map((c, i) => {
    const seeds: Record<string, number>[] = [];
    first.forEach((other, j) => {
      if (j === i || !other.converged) return;
      const seed: Record<string, number> = {};
      for (const p of other.parameters) {
        if ((SHARED_GEOMETRY as readonly string[]).includes(p.name) && c.model.parameters.some((q) => q.name === p.name)) seed[p.name] = p.value;
      }
      if (Object.keys(seed).length > 0) seeds.push(seed);
    });
    if (seeds.length === 0) return first[i];
    const seeded = fitWithStarts(profile, c.model, { ...(c.options ?? {}), autoStart: false }, seeds);
    const own = first[i];
    const gain = own.statistics.objective - seeded.statistics.objective;
    const tolerance = 1e-3 * Math.max(1, own.statistics.reducedChi2) + 1e-6 * Math.abs(own.statistics.objective);
    const better = seeded.converged && (!own.converged || gain > tolerance);
    if (!better) return own;
    const method = `${seeded.starts?.method ?? "seeded"} (better than its own starts by ${gain.toPrecision(3)} in the objective)`;
    return { ...seeded, starts: seeded.starts ? { ...seeded.starts, method } : seeded.starts };
  });
}
