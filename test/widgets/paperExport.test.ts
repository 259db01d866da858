// The widgets' export buttons save the paper figure of the current state: the same
// src/report/figures description the headless exporter (kernel-ext/figures) renders, drawn by
// the same renderer, so the saved SVG equals the exporter's SVG of the same state.
import { readFile } from "node:fs/promises";
import type { Download } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getModel } from "../../src/physics/index.js";
import { coherenceBandFigure } from "../../src/report/figures/coherenceScanFigure.js";
import { comparisonFigure } from "../../src/report/figures/comparisonFigure.js";
import { correlationFigure } from "../../src/report/figures/correlationFigure.js";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { fitFigure } from "../../src/report/figures/fitFigure.js";
import { profileLikelihoodFigure } from "../../src/report/figures/profileLikelihoodFigure.js";
import { FigureRenderer } from "../../kernel-ext/figures/exportFigure.js";
import { effectiveMask, paramVector, residuals, type ParamState } from "../../widgets/shared/preview.js";
import { hasChromium } from "./browser.js";
import { openHarness, type HarnessPage } from "./page.js";

const run = hasChromium() ? describe : describe.skip;
if (!hasChromium()) console.warn("test/widgets: /usr/bin/chromium not installed; paper-export tests skipped (apt-get install chromium)");

/** Plain text of every <text> element of an SVG, in document order. */
function svgTexts(svg: string): string[] {
  return [...svg.matchAll(/<text\b[^>]*>(.*?)<\/text>/g)].map((m) => m[1]!.replace(/<[^>]*>/g, "").replace(/&amp;/g, "&"));
}

/** The legend names appear as text lines of the SVG, in this order. */
function expectLegend(svg: string, names: string[]): void {
  const texts = svgTexts(svg);
  const at = names.map((n) => texts.indexOf(n));
  expect(at.every((i) => i >= 0), `legend ${JSON.stringify(names)} in ${JSON.stringify(texts)}`).toBe(true);
  expect([...at].sort((a, b) => a - b)).toEqual(at);
}

run("widget export buttons save the paper figure (Chromium)", () => {
  let h: HarnessPage;
  let renderer: FigureRenderer;
  beforeAll(async () => {
    h = await openHarness();
    renderer = await FigureRenderer.start();
  }, 120_000);
  afterAll(async () => {
    await h?.close();
    await renderer?.close();
  });

  async function show(model: string, stateExpr: string): Promise<string> {
    const id = (await h.page.evaluate(`fk.show(${JSON.stringify(model)}, ${stateExpr})`)) as string;
    await h.page.waitForSelector(`#host-${id} .js-plotly-plot .main-svg`, { state: "attached" });
    return id;
  }

  /** Press the export button and return the downloaded files (name → contents). */
  async function press(id: string, format: "svg" | "png", files = 1): Promise<Map<string, Buffer>> {
    const downloads: Download[] = [];
    const events = new Promise<Download[]>((resolve) => {
      h.page.on("download", function onDownload(d) {
        downloads.push(d);
        if (downloads.length === files) {
          h.page.off("download", onDownload);
          resolve(downloads);
        }
      });
    });
    await h.page.click(`#host-${id} button[data-action=export-${format}]`);
    const out = new Map<string, Buffer>();
    for (const d of await events) out.set(d.suggestedFilename(), await readFile((await d.path())!));
    return out;
  }

  async function headlessSvg(figure: FigureSpec): Promise<string> {
    return new TextDecoder().decode(await renderer.render(figure, "svg"));
  }

  /** The browser's file is the headless exporter's SVG of the same figure, byte for byte (one renderer for both). */
  async function expectSame(saved: Buffer, figure: FigureSpec): Promise<void> {
    const browser = saved.toString("utf8");
    expect(browser).toMatch(new RegExp(`<svg\\b[^>]*width="${figure.layout.meta.widthMm}mm"`));
    expect(browser).toContain("<path ");
    expect(browser).toBe(await headlessSvg(figure));
  }

  it("explorer: SVG export is fitFigure(profile with the current mask, slider model) at single-column size", async () => {
    const id = await show("ExplorerModel", "fk.b1State(512)");
    const v = JSON.stringify(id);
    // Exclude a region as a drag in Mask mode would, so the figure has its "excluded" trace.
    await h.page.evaluate(`(() => { const m = fk.views.get(${v}).model; m.set("masked_ranges", [[0.2e-3, 0.4e-3]]); m.save_changes(); })()`);
    await h.page.waitForTimeout(100);
    const files = await press(id, "svg");
    expect([...files.keys()]).toEqual(["fringekit-explorer-two-slit.svg"]);
    const state = (await h.page.evaluate(`(() => { const w = fk.views.get(${v}); return { x: Array.from(w.model.get("x").data), y: Array.from(w.model.get("y").data), params: w.liveParams }; })()`)) as
      { x: number[]; y: number[]; params: Record<string, ParamState> };
    // The same state built here in Node, as cell code would hand it to the headless exporter.
    const model = getModel("two-slit");
    const x = Float64Array.from(state.x);
    const y = Float64Array.from(state.y);
    const mask = effectiveMask(x, null, null, [[0.2e-3, 0.4e-3]]);
    const curve = new Float64Array(x.length);
    model.evaluate(x, paramVector(model, state.params, new Float64Array(model.parameters.length)), curve);
    const resid = residuals(y, curve, null, "sqrt-model", mask, new Float64Array(x.length));
    const figure = fitFigure({ x, y, mask, yUnit: "counts", counts: true }, { modelId: "two-slit", model: curve, residuals: resid }, { modelLabel: "model (sliders)" });
    expect(figure.layout.meta.widthMm).toBe(85); // single column, the builder's default
    const saved = files.get("fringekit-explorer-two-slit.svg")!;
    expect(saved.toString("utf8")).toContain("model (sliders)");
    expectLegend(saved.toString("utf8"), ["data", "excluded", "model (sliders)"]);
    await expectSame(saved, figure);
    // The screen figure keeps its canvas-drawn live layer.
    expect(await h.page.evaluate(`fk.views.get(${v}).plotEl.data[2].y.length`)).toBe(1);
    expect(h.errors).toEqual([]);
  }, 60_000);

  it("explorer: after a fit arrives the export draws the fitted curve; PNG at 300 dpi has the headless exporter's pixel size", async () => {
    const id = await show("ExplorerModel", "fk.b1State(256)");
    const v = JSON.stringify(id);
    // A fit result as the kernel sends it (curve: the slider model moved by 1 %, invented).
    await h.page.evaluate(`(() => { const w = fk.views.get(${v}); const c = w.curve.map((f) => 1.01 * f);
      w.model.set({ fit_curve: { data: c, shape: [c.length] }, fit_state: "done",
        result: { modelId: "two-slit", noise: "poisson", converged: true, reason: "converged-objective", message: "ok", iterations: 3, parameters: [], statistics: { n: 256, nFree: 7, dof: 249, chi2: 250, reducedChi2: 1, aic: 1, bic: 1 }, warnings: [] } }); })()`);
    await h.page.waitForTimeout(100);
    const svg = (await press(id, "svg")).get("fringekit-explorer-two-slit.svg")!.toString("utf8");
    expectLegend(svg, ["data", "two-slit fit"]);
    const state = (await h.page.evaluate(`(() => { const w = fk.views.get(${v}); return { x: Array.from(w.model.get("x").data), y: Array.from(w.model.get("y").data), fit: Array.from(w.model.get("fit_curve").data) }; })()`)) as
      { x: number[]; y: number[]; fit: number[] };
    const x = Float64Array.from(state.x);
    const y = Float64Array.from(state.y);
    const curve = Float64Array.from(state.fit);
    const mask = new Uint8Array(x.length).fill(1);
    const figure = fitFigure({ x, y, mask, yUnit: "counts", counts: true }, { modelId: "two-slit", model: curve, residuals: residuals(y, curve, null, "sqrt-model", mask, new Float64Array(x.length)) });
    await expectSame(Buffer.from(svg), figure);

    const png = (await press(id, "png")).get("fringekit-explorer-two-slit.png")!;
    const headless = Buffer.from(await renderer.render(figure, "png"));
    expect(png.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])); // PNG signature (ISO/IEC 15948)
    // IHDR width and height; 85 mm at 300 dpi is about 1004 px wide (85 / 25.4 × 300, common practice).
    expect([png.readUInt32BE(16), png.readUInt32BE(20)]).toEqual([headless.readUInt32BE(16), headless.readUInt32BE(20)]);
    expect(Math.abs(png.readUInt32BE(16) - (85 / 25.4) * 300)).toBeLessThan(4);
    expect(png.includes(Buffer.from("pHYs"))).toBe(true);
  }, 60_000);

  it("comparison: SVG export is comparisonFigure of the fits in table order at double-column size", async () => {
    const id = await show("ComparisonModel", "fk.comparisonState(1024)");
    const v = JSON.stringify(id);
    const files = await press(id, "svg");
    expect([...files.keys()]).toEqual(["fringekit-comparison.svg"]);
    const s = (await h.page.evaluate(`(() => { const m = fk.views.get(${v}).model; return { x: Array.from(m.get("x").data), y: Array.from(m.get("y").data),
      curves: Array.from(m.get("curves").data), resid: Array.from(m.get("residuals").data), table: m.get("table") }; })()`)) as
      { x: number[]; y: number[]; curves: number[]; resid: number[]; table: { label: string; modelId: string }[] };
    const n = s.x.length;
    const fits = s.table.map((r, i) => ({ label: r.label, result: { modelId: r.modelId, model: Float64Array.from(s.curves.slice(i * n, (i + 1) * n)), residuals: Float64Array.from(s.resid.slice(i * n, (i + 1) * n)) } }));
    const figure = comparisonFigure({ x: Float64Array.from(s.x), y: Float64Array.from(s.y), yUnit: "counts", counts: false }, fits);
    expect(figure.layout.meta.widthMm).toBe(180); // double column, the builder's default
    const saved = files.get("fringekit-comparison.svg")!;
    expectLegend(saved.toString("utf8"), ["data", ...s.table.map((r) => r.label)]);
    await expectSame(saved, figure);
  }, 60_000);

  it("uncertainty: export saves profileLikelihoodFigure and correlationFigure, one file each", async () => {
    const id = await show("UncertaintyModel", "fk.uncertaintyState()");
    const v = JSON.stringify(id);
    const files = await press(id, "svg", 2);
    expect([...files.keys()].sort()).toEqual(["fringekit-uncertainty-1.svg", "fringekit-uncertainty-2.svg"]);
    const s = (await h.page.evaluate(`(() => { const m = fk.views.get(${v}).model; return { params: m.get("parameters"), grid: Array.from(m.get("grid").data), delta: Array.from(m.get("delta").data),
      names: m.get("free_names"), corr: Array.from(m.get("correlation").data) }; })()`)) as
      { params: { name: string; unit: string; best: number; uncertainty: number }[]; grid: number[]; delta: number[]; names: string[]; corr: number[] };
    const m = s.grid.length / s.params.length;
    const curves = s.params.map((p, i) => ({ name: p.name, unit: p.unit, best: p.best, uncertainty: p.uncertainty,
      values: Float64Array.from(s.grid.slice(i * m, (i + 1) * m)), deltaObjective: Float64Array.from(s.delta.slice(i * m, (i + 1) * m)) }));
    await expectSame(files.get("fringekit-uncertainty-1.svg")!, profileLikelihoodFigure(curves));
    await expectSame(files.get("fringekit-uncertainty-2.svg")!, correlationFigure({ modelId: "", freeNames: s.names, correlation: Float64Array.from(s.corr) }));
  }, 60_000);

  it("coherence scan: SVG export is the coherence-scan figure of the measured points and the kernel's band", async () => {
    const id = await show("CoherenceScanModel", "fk.coherenceState()");
    const v = JSON.stringify(id);
    const files = await press(id, "svg");
    const s = (await h.page.evaluate(`(() => { const m = fk.views.get(${v}).model; const a = (k) => Array.from(m.get(k).data);
      return { sep: a("separation"), vis: a("visibility"), err: a("visibility_err"), grid: a("curve_separation"), center: a("curve_visibility"), lower: a("band_lower"), upper: a("band_upper") }; })()`)) as
      Record<string, number[]>;
    const f = (k: string) => Float64Array.from(s[k]!);
    const figure = coherenceBandFigure({ x: f("sep"), y: f("vis"), sigma: f("err"), yUnit: "1", counts: false }, f("grid"),
      { center: f("center"), lower: f("lower"), upper: f("upper"), level: 0.95 }, "source model");
    const saved = files.get("fringekit-coherence-scan.svg")!;
    expectLegend(saved.toString("utf8"), ["measured", "source model fit", "95 % confidence band"]);
    await expectSame(saved, figure);
    expect(h.errors).toEqual([]);
  }, 60_000);

  it("export with nothing to draw, or a figure the builder refuses, says why beside the buttons", async () => {
    const empty = (await h.page.evaluate(`fk.show("ComparisonModel", {})`)) as string;
    await h.page.click(`#host-${empty} button[data-action=export-svg]`);
    await expect.poll(() => h.page.textContent(`#host-${empty} [data-region=export-error]`)).toMatch(/nothing to export yet/);
    // comparisonFigure draws 1 to 4 fits; a table row without its curve is refused with the builder's message.
    const id = await show("ComparisonModel", "fk.comparisonState(256)");
    await h.page.evaluate(`(() => { const m = fk.views.get(${JSON.stringify(id)}).model; m.set("curves", { data: new Float64Array(3 * 100), shape: [3, 100] }); })()`);
    await h.page.click(`#host-${id} button[data-action=export-png]`);
    await expect.poll(() => h.page.textContent(`#host-${id} [data-region=export-error]`)).toMatch(/Export failed: .*fits of this profile/);
  }, 60_000);
});
