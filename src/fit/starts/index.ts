/**
 * Automatic candidate starts for every built-in model and for bounded formula models: picks the
 * heuristic by the model's parameters (and id for the near field), ranks its candidates
 * (rank.ts) and returns the best few, best first, with a short name of the method.
 */
import type { PreparedFit } from "../preparedFit.js";
import { coherenceScanCandidates } from "./coherenceScan.js";
import { startContext } from "./context.js";
import { designCandidates } from "./design.js";
import { farFieldCandidates, rankingStandIn, twoBeamCandidates } from "./farField.js";
import { nearFieldCandidates } from "./nearField.js";
import { rankCandidates } from "./rank.js";

export { rankCandidates, rescaleCandidate, type RankedStart } from "./rank.js";
export { searchStarts, summarizeStarts, sameOptimum, objectiveTolerance, type SearchResult, type StartRun } from "./search.js";

/** Candidate starts of one fit and where they came from. */
export interface StartPlan {
  /** SI values by parameter name, best-ranked first. */
  candidates: Record<string, number>[];
  /** Heuristic used ("none" when the model has no heuristic and no bounded free parameter). */
  method: string;
}

/** How many ranked candidates the global stage gets (enough to confirm the best twice over). */
export const CANDIDATES_KEPT = 4;

/**
 * Candidate starts for a prepared fit (see module comment). Models and their heuristics:
 * two-slit-fresnel → near-field clues; coherence-disc/-gaussian → half-visibility point and size
 * ladder; two-beam → Gaussian envelope; far-field slit models (two-slit, single-slit, n-slit,
 * broadband, spectrum, source-size) → spectrum and envelope; anything else with bounded free
 * parameters → space-filling design.
 */
export function startCandidates(prep: PreparedFit): StartPlan {
  const ctx = startContext(prep);
  const { has } = ctx;
  let method: string;
  let raw: Record<string, number>[];
  if (prep.model.id === "two-slit-fresnel") {
    method = "near-field shadows and fringe period";
    raw = nearFieldCandidates(ctx);
  } else if ((has("diameter") || has("rmsSize")) && !has("center") && has("wavelength") && has("sourceDistance")) {
    method = "coherence scan: half-visibility point and size ladder";
    raw = coherenceScanCandidates(ctx);
  } else if (has("beamWaist") && has("center") && has("separation") && has("wavelength") && has("distance")) {
    method = "two-beam spectrum and Gaussian envelope";
    raw = twoBeamCandidates(ctx);
  } else if (has("amplitude") && has("center") && has("distance") && (has("separation") || has("width")) && (has("wavelength") || prep.model.id === "two-slit-spectrum")) {
    method = "far-field spectrum and envelope";
    raw = farFieldCandidates(ctx);
  } else {
    raw = designCandidates(ctx);
    method = raw.length > 0 ? "space-filling design over the bounds" : "none";
  }
  const stride = prep.model.id === "two-slit-fresnel" ? Math.max(1, Math.floor(prep.x.length / 1024)) : 1;
  const ranked = raw.length > 0 ? rankCandidates(rankingStandIn(prep), raw, CANDIDATES_KEPT, stride) : [];
  return { candidates: ranked.map((r) => r.start), method };
}
