// Kernel-side comparison, uncertainty and coherence-scan widgets, and the widget state they
// leave in a notebook, validated against the published @jupyter-widgets/schema v2.
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { Ajv } from "ajv";
import { describe, expect, it } from "vitest";
import { fitProfile } from "../../src/fit/fitProfile.js";
import { getModel } from "../../src/physics/index.js";
import { MIME_BUNDLE } from "../../kernel-ext/display.js";
import { comparison } from "../../kernel-ext/widgets/comparison.js";
import { b1Profile, b1Start, demoWidgets } from "./demoWidgets.js";
import { installFakeKernel } from "./fakeKernel.js";

const require = createRequire(import.meta.url);

describe("kernel-side widgets", () => {
  const { state, ids } = demoWidgets(512);

  it("widgetStateFromMessages(...) validates against @jupyter-widgets/schema v2 state.schema.json", () => {
    const schema = JSON.parse(readFileSync(require.resolve("@jupyter-widgets/schema/v2/state.schema.json"), "utf8"));
    const validate = new Ajv({ strict: false }).compile(schema);
    expect(validate(state), JSON.stringify(validate.errors)).toBe(true);
    expect(Object.keys(state.state).sort()).toEqual(Object.values(ids).sort());
  });

  it("comparison(profile, fits) ranks by AIC and sends curves and residuals as k × n float64 buffers", () => {
    const model = state.state[ids.comparison]!;
    const table = model.state.table as { label: string; deltaAic: number; weight: number }[];
    expect(table[0]!.label).toBe("two-slit, V free");
    expect(table[0]!.deltaAic).toBe(0);
    expect(table.map((r) => r.deltaAic)).toEqual([...table.map((r) => r.deltaAic)].sort((a, b) => a - b));
    expect(model.state.curves).toMatchObject({ dtype: "float64", shape: [3, 512] });
    const curves = model.buffers!.find((b) => b.path[0] === "curves")!;
    expect(Buffer.from(curves.data, "base64").byteLength).toBe(3 * 512 * 8);
    expect(String(model.state.verdict)).toContain("two-slit, V free");
  });

  it("comparison(...)[MIME_BUNDLE]() text fallback is the comparison report with each fit's goodness of fit", () => {
    const kernel = installFakeKernel();
    try {
      const profile = b1Profile(512);
      const model = getModel("two-slit");
      const fix = { wavelength: 632.8e-9, distance: 1 };
      const free = fitProfile(profile, model, { fix, start: b1Start });
      const coherent = fitProfile(profile, model, { fix: { ...fix, visibility: 1 }, start: b1Start });
      const cmp = comparison(profile, [{ label: "V free", result: free }, { label: "V = 1", result: coherent }]);
      const text = (cmp[MIME_BUNDLE]() as Record<string, string>)["text/plain"]!;
      const row = text.split("\n").find((line) => /^\s*V free\s{2,}/.test(line))!;
      // The goodness-of-fit column comes from the fits themselves ("–" only when the table lacks them).
      expect(row.split(/\s{2,}/)[1]).toBe(free.goodness.verdict === "not-tested" ? "not tested" : free.goodness.verdict === "poor" ? "POOR" : free.goodness.verdict);
    } finally {
      kernel.uninstall();
    }
  });

  it("the comparison widget's table rows are the one comparison row (as compare --json's ranking and the report table)", () => {
    const table = state.state[ids.comparison]!.state.table as Record<string, unknown>[];
    expect(Object.keys(table[0]!).sort()).toEqual(["aic", "aicc", "bic", "chi2", "converged", "deltaAic", "deltaAicc", "deltaBic", "k", "label", "logLikelihood", "modelId", "n", "reducedChi2", "residualsStructured", "weight"]);
  });

  it("uncertainty(result, ...) profiles each parameter: Δ ≈ 0 at the best fit, intervals bracket it", () => {
    const model = state.state[ids.uncertainty]!;
    const params = model.state.parameters as { name: string; best: number; interval: [number, number] }[];
    expect(params.map((p) => p.name)).toEqual(["separation", "width", "visibility", "phase"]);
    const delta = new Float64Array(Buffer.from(model.buffers!.find((b) => b.path[0] === "delta")!.data, "base64").buffer.slice(0));
    // 11-point grids centred on the optimum: the middle point is the best fit (Δ = 0 up to solver tolerance).
    for (let k = 0; k < 4; k++) expect(delta[k * 11 + 5]).toBeLessThan(1e-3);
    for (const p of params) {
      expect(p.interval[0]).toBeLessThan(p.best);
      expect(p.interval[1]).toBeGreaterThan(p.best);
    }
    expect(model.state.correlation).toMatchObject({ dtype: "float64" });
  });

  it("coherenceScan(scan, fit, model) sends the curve inside its band and the fitted source size", () => {
    const model = state.state[ids.coherence]!;
    const read = (key: string) => {
      const b = model.buffers!.find((x) => x.path[0] === key)!;
      const bytes = Buffer.from(b.data, "base64");
      return new Float64Array(bytes.buffer, bytes.byteOffset, bytes.byteLength / 8);
    };
    const [center, lower, upper] = [read("curve_visibility"), read("band_lower"), read("band_upper")];
    for (let i = 0; i < center.length; i++) {
      expect(lower[i]).toBeLessThanOrEqual(center[i]! + 1e-12);
      expect(upper[i]).toBeGreaterThanOrEqual(center[i]! - 1e-12);
    }
    const size = (model.state.quantities as { name: string; value: number; uncertainty: number }[]).find((q) => q.name === "rmsSize")!;
    // Simulated source rms size 0.12 mm; the fit must find it within 3 standard errors.
    expect(Math.abs(size.value - 0.12e-3)).toBeLessThan(3 * size.uncertainty);
  });
});
