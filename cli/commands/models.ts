/** `fringekit models [--json]`: the models and their parameters. */
import { listModels } from "../../src/advanced.js";
import { parseArgs } from "../parseArgs.js";
import type { CommandOutput } from "../output.js";

/** Runs the models command; returns what to print. */
export function modelsCommand(words: readonly string[]): CommandOutput {
  const args = parseArgs(words, { json: { kind: "flag" } }, "models");
  if (args.positionals.length > 0) return { stdout: "", exitCode: 2, error: `models takes no file (got "${args.positionals[0]}")` };
  const models = listModels();
  if (args.flags.has("json")) {
    const json = models.map((m) => ({
      id: m.id,
      description: m.description,
      axis: m.axis,
      parameters: m.parameters.map((p) => ({
        name: p.name, unit: p.unit, default: p.default,
        lower: Number.isFinite(p.lower) ? p.lower : null, upper: Number.isFinite(p.upper) ? p.upper : null,
        fixedByDefault: p.fixedByDefault ?? false, integer: p.integer ?? false, description: p.description,
      })),
    }));
    return { stdout: `${JSON.stringify(json, null, 2)}\n`, exitCode: 0 };
  }
  const lines: string[] = [];
  for (const m of models) {
    lines.push(`${m.id}  (x = ${m.axis === "detector" ? "detector position" : "slit separation"})`);
    lines.push(`  ${m.description}`);
    const rows = m.parameters.map((p) => [p.name, p.unit, String(p.default), `[${bound(p.lower)}, ${bound(p.upper)}]`, `${p.fixedByDefault ? "(fixed) " : ""}${p.description}`]);
    const widths = [0, 1, 2, 3].map((c) => Math.max(...rows.map((r) => r[c]!.length), ["name", "unit", "default", "bounds"][c]!.length));
    const pad = (r: string[]): string => `    ${r.slice(0, 4).map((cell, c) => cell.padEnd(widths[c]!)).join("  ")}  ${r[4] ?? ""}`.trimEnd();
    lines.push(pad(["name", "unit", "default", "bounds", "meaning"]));
    for (const r of rows) lines.push(pad(r));
    lines.push("");
  }
  lines.push(AMPLITUDE_NOTE);
  lines.push("Values are SI (m, rad, counts); give them with units on the command line, e.g. --set wavelength=632.8nm.");
  return { stdout: `${lines.join("\n")}\n`, exitCode: 0 };
}

/** What `amplitude` means, the same in every model. */
export const AMPLITUDE_NOTE = "amplitude means the same in every model: the peak above background of the fully coherent pattern " +
  "(visibility 1, narrow band, point source). Two-beam models: I = background + (amplitude/2)·envelope·(1 + V cos), so the " +
  "observed peak is amplitude·(1 + V)/2; n-slit and single-slit: the central maximum; two-slit-fresnel: the far-field peak of " +
  "the same slits (illuminating intensity = amplitude·λL/(N a)²), which the near-field pattern approaches as a²/(λL) → 0.";

function bound(value: number): string {
  return value === Infinity ? "∞" : value === -Infinity ? "−∞" : String(value);
}
