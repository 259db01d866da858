/**
 * Coherence scan view: measured fringe visibility against slit separation with error bars,
 * the fitted source model and its confidence band, and the fitted source quantities.
 */
import { coherenceBandFigure } from "../../src/report/figures/coherenceScanFigure.js";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import type { ShapedArray } from "./arrayWire.js";
import { h, setChildren } from "./dom.js";
import { displayUnitFor, formatNumber, formatWithUncertainty } from "./displayUnits.js";
import { axis, baseLayout, FigureView } from "./figureView.js";
import type { ScanQuantity } from "./coherenceScanModel.js";
import { palette } from "./styles.js";

export class CoherenceScanView extends FigureView {
  private sideEl!: HTMLDivElement;

  protected exportName(): string {
    return "fringekit-coherence-scan";
  }

  /**
   * The paper figure of the scan (coherenceBandFigure: what coherenceScanFigure draws in the
   * headless exporter) from the band the kernel computed on the paper figure's grid.
   */
  paperFigures(): FigureSpec[] {
    const get = (name: string) => (this.model.get(name) as ShapedArray<Float64Array> | null)?.data ?? null;
    const sep = get("separation");
    const vis = get("visibility");
    const grid = get("curve_separation");
    const center = get("curve_visibility");
    const lower = get("band_lower");
    const upper = get("band_upper");
    if (!sep || !vis || !grid || !center || !lower || !upper) return [];
    const err = get("visibility_err");
    const scan = { x: Float64Array.from(sep), y: Float64Array.from(vis), yUnit: "1", counts: false, ...(err ? { sigma: Float64Array.from(err) } : {}) };
    const band = { center: Float64Array.from(center), lower: Float64Array.from(lower), upper: Float64Array.from(upper), level: Number(this.model.get("band_level")) || 0.95 };
    return [coherenceBandFigure(scan, Float64Array.from(grid), band, (this.model.get("model_id") as string) || "source model")];
  }

  override render(): void {
    this.buildFrame(this.model.get("title") as string, 380);
    this.sideEl = h("div", { class: "fk-side", "data-region": "source" });
    this.root.append(h("div", { class: "fk-body" }, this.plotEl, this.sideEl));
    this.listenTo(this.model, "change", () => this.update());
    this.update();
  }

  override update(): void {
    const quantities = this.model.get("quantities") as ScanQuantity[];
    setChildren(this.sideEl,
      h("div", { class: "fk-section" }, h("h4", {}, "Source model"), h("div", {}, (this.model.get("source_label") as string) || "—")),
      h("div", { class: "fk-section" }, h("h4", {}, "Fitted"),
        h("table", { class: "fk-table" }, h("tbody", {}, ...quantities.map((q) => {
          const unit = displayUnitFor(q.unit, q.value);
          const shown = q.uncertainty === null ? formatNumber(q.value * unit.factor) : formatWithUncertainty(q.value * unit.factor, q.uncertainty * unit.factor);
          return h("tr", { "data-quantity": q.name }, h("td", {}, q.name), h("td", {}, shown), h("td", {}, unit.label));
        })))));
    void this.draw();
  }

  protected redrawAll(): void {
    void this.draw();
  }

  private async draw(): Promise<void> {
    const get = (name: string) => (this.model.get(name) as ShapedArray<Float64Array> | null)?.data ?? null;
    const sep = get("separation");
    const vis = get("visibility");
    if (!sep || !vis) return;
    const curveSep = get("curve_separation");
    const unit = displayUnitFor("m", Math.max(...Array.from(sep, Math.abs)));
    const scale = (a: Float64Array) => a.map((v) => v * unit.factor);
    const err = get("visibility_err");
    const data: Record<string, unknown>[] = [];
    const lower = get("band_lower");
    const upper = get("band_upper");
    if (curveSep && lower && upper) {
      data.push({ type: "scatter", mode: "lines", x: scale(curveSep), y: lower, line: { width: 0 }, hoverinfo: "skip", showlegend: false });
      data.push({ type: "scatter", mode: "lines", x: scale(curveSep), y: upper, fill: "tonexty", fillcolor: palette.band, line: { width: 0 }, name: "confidence band", hoverinfo: "skip" });
    }
    const curve = get("curve_visibility");
    if (curveSep && curve) {
      data.push({ type: "scatter", mode: "lines", x: scale(curveSep), y: curve, line: { color: palette.fit, width: 2 }, name: (this.model.get("source_label") as string) || "source model" });
    }
    data.push({ type: "scatter", mode: "markers", x: scale(sep), y: vis, name: "measured",
      marker: { color: palette.model, size: 7, symbol: "diamond" },
      error_y: err ? { type: "data", array: err, visible: true, color: palette.model, thickness: 1.2, width: 3 } : undefined });
    await this.drawFigure(data, baseLayout({
      xaxis: axis(`slit separation (${unit.label})`, { rangemode: "tozero" }),
      yaxis: axis("visibility", { range: [0, 1.05] }),
      height: 380,
    }));
  }
}
