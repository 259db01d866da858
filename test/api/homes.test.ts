// One home for each piece: which folder may import which (DEVELOPERS.md, "Layout").
// The rules are the project's own layering; the check reads every import specifier of every
// TypeScript file under the folders named, resolved against the importing file.
import { readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import * as advanced from "../../src/advanced.js";
import * as api from "../../src/index.js";

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), "../..");

function tsFiles(folder: string): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const path = join(dir, name);
      if (statSync(path).isDirectory()) {
        if (name !== "dist" && name !== "node_modules") walk(path);
      } else if (/\.ts$/.test(name) && !name.endsWith(".d.ts")) out.push(path);
    }
  };
  walk(join(ROOT, folder));
  return out;
}

/** Relative imports of a file (static, dynamic and re-exports), as paths from the repository root. */
function importsOf(file: string): string[] {
  const text = readFileSync(file, "utf8");
  const found: string[] = [];
  for (const m of text.matchAll(/(?:from\s+|import\s*\(\s*|import\s+)["'](\.{1,2}\/[^"']+)["']/g)) {
    found.push(relative(ROOT, resolve(dirname(file), m[1]!)).split("\\").join("/"));
  }
  return found;
}

/** "file → import" for every import of a file under `from` that starts with one of `forbidden`. */
function crossings(from: string, forbidden: readonly string[]): string[] {
  const out: string[] = [];
  for (const file of tsFiles(from)) {
    for (const target of importsOf(file)) {
      if (forbidden.some((f) => target === f || target.startsWith(`${f}/`))) out.push(`${relative(ROOT, file)} → ${target}`);
    }
  }
  return out;
}

describe("one home for each piece", () => {
  it("widgets/src never imports kernel-ext, kernel-ext never imports widgets/src", () => {
    expect(crossings("widgets/src", ["kernel-ext"])).toEqual([]);
    expect(crossings("kernel-ext", ["widgets/src"])).toEqual([]);
  });

  it("widgets/shared imports only src/ and itself", () => {
    expect(crossings("widgets/shared", ["kernel-ext", "widgets/src", "cli"])).toEqual([]);
  });

  it("math/ (special functions) sits below everything: it imports only src/errors and itself; fit/ takes them from math/", () => {
    const allowed = (target: string) => target.startsWith("src/math/") || target === "src/errors.js";
    const out: string[] = [];
    for (const file of tsFiles("src/math")) for (const target of importsOf(file)) if (!allowed(target)) out.push(`${relative(ROOT, file)} → ${target}`);
    expect(out).toEqual([]);
    expect(crossings("src/fit", ["src/stats/gamma.js", "src/stats/beta.js", "src/stats/normal.js", "src/stats/chiSquared.js", "src/stats/studentT.js", "src/stats/fDistribution.js"])).toEqual([]);
  });

  it("report/ formats and draws: it neither fits nor compares fits", () => {
    // The fitter, the refit helpers, the bootstraps and the comparison engine live in fit/, stats/ and api/.
    const fitting = ["src/fit/fitProfile.js", "src/fit/refit.js", "src/fit/profileInterval.js", "src/fit/bootstrap.js", "src/stats/compareFits.js", "src/api"];
    expect(crossings("src/report", fitting)).toEqual([]);
  });

  it("src/ imports nothing outside src/", () => {
    expect(crossings("src", ["kernel-ext", "widgets", "cli", "bench", "scripts", "test"])).toEqual([]);
  });

  it("one name per physical quantity: coherenceLength and farFieldValidity, the same function in both entries", () => {
    for (const entry of [api, advanced] as Record<string, unknown>[]) {
      expect(entry.coherenceLengthFromBandwidth).toBeUndefined();
      expect(entry.farFieldCheck).toBeUndefined();
    }
    expect(advanced.farFieldValidity).toBe(api.farFieldValidity);
    expect(advanced.coherenceLength).toBe(api.coherenceLength);
    // λ²/Δλ = (632.8 nm)²/(1 nm) = 0.40043584 mm (hand-computed), from plain numbers or ± u alike.
    expect(api.coherenceLength(632.8e-9, 1e-9).value).toBeCloseTo(4.0043584e-4, 12);
    expect(api.coherenceLength({ value: 632.8e-9, uncertainty: 0 }, 1e-9)).toEqual(api.coherenceLength(632.8e-9, 1e-9));
    // A planned geometry (a²/(λL) = (0.1 mm)²/(632.8 nm · 1 m) = 0.0158, below the 0.1 limit) through the advanced entry too.
    expect(advanced.farFieldValidity({ width: 0.1e-3, separation: 0.5e-3, wavelength: 632.8e-9, distance: 1 }).fresnelNumber).toBeCloseTo(0.0158028, 6);
  });
});
