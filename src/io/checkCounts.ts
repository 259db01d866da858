/**
 * Count-noise sanity: the Poisson model needs non-negative integer counts.
 */
import type { Profile } from "../profile.js";

/**
 * Warnings when a profile fitted with a count-based noise model holds negative or
 * non-integer values (e.g. after dark subtraction or averaging); empty when all is well.
 * @param profile the data
 */
export function checkCountsForPoisson(profile: Profile): string[] {
  let negative = 0;
  let fractional = 0;
  for (let i = 0; i < profile.y.length; i++) {
    if (profile.mask && profile.mask[i] === 0) continue;
    const v = profile.y[i]!;
    if (v < 0) negative++;
    else if (!Number.isInteger(v)) fractional++;
  }
  const out: string[] = [];
  const where = profile.provenance?.source ?? "profile";
  if (negative > 0) out.push(`${where}: ${negative} negative values, which are not counts; the Poisson noise model treats them as zero-probability (use gaussian or robust noise)`);
  if (fractional > 0) out.push(`${where}: ${fractional} non-integer values, which are not raw counts (dark-subtracted, averaged or scaled?); the Poisson model's uncertainties assume raw counts`);
  return out;
}
