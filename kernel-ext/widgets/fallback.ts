/**
 * What frontends without widget support show instead of a widget: text/plain and text/html
 * with the same facts (data, model, latest result table).
 */
import type { FitResult } from "../../src/fit/types.js";
import type { Profile } from "../../src/profile.js";
import { escapeHtml } from "../../src/report/escape.js";
import { fitReport } from "../../src/report/tableReport.js";

/** Text and HTML for a widget: a heading line, facts, and an optional report table. */
export function fallbackBundle(heading: string, facts: string[], report: { toString(): string; toHtml(): string } | null): Record<string, string> {
  const plain = [heading, ...facts.map((f) => `  ${f}`), ...(report ? ["", report.toString()] : [])].join("\n");
  const html = `<div class="fringekit-fallback"><p><strong>${escapeHtml(heading)}</strong> (interactive view needs the fringekit widgets in this frontend)</p>` +
    `<ul>${facts.map((f) => `<li>${escapeHtml(f)}</li>`).join("")}</ul>${report ? report.toHtml() : ""}</div>`;
  return { "text/plain": plain, "text/html": html };
}

/** Fallback of the profile explorer. */
export function explorerFallback(profile: Profile, modelId: string, result: FitResult | null): Record<string, string> {
  const n = profile.x.length;
  const facts = [
    `${n} points, ${(profile.x[0]! * 1e3).toFixed(3)} … ${(profile.x[n - 1]! * 1e3).toFixed(3)} mm, y in ${profile.yUnit}`,
    `model ${modelId}`,
    result ? `latest fit: ${result.converged ? "converged" : "not converged"} (${result.message})` : "no fit yet",
  ];
  return fallbackBundle("Profile explorer", facts, result ? fitReport(result) : null);
}
