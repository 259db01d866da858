/**
 * Model comparison view: the profile with every fitted model overlaid, their residuals in a
 * panel below, and the comparison table (reduced χ², AIC, BIC, ΔAIC, Akaike weight) with the verdict.
 */
import { comparisonFigure } from "../../src/report/figures/comparisonFigure.js";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { row, type ShapedArray } from "./arrayWire.js";
import { h, setChildren } from "./dom.js";
import { displayUnitFor, formatNumber } from "./displayUnits.js";
import { axis, baseLayout, FigureView } from "./figureView.js";
import type { ComparisonRow } from "./comparisonModel.js";
import { groupsOf } from "./paperExport.js";
import { palette } from "./styles.js";

/** Fixed decimals for everyday magnitudes, 3 significant digits in exponent form above 10⁵. */
function fixedOrExp(value: number, decimals: number): string {
  if (!Number.isFinite(value)) return String(value);
  return Math.abs(value) >= 1e5 ? value.toExponential(2) : value.toFixed(decimals);
}

export class ComparisonView extends FigureView {
  private tableEl!: HTMLDivElement;

  protected exportName(): string {
    return "fringekit-comparison";
  }

  /**
   * Paper figures of the comparison (comparisonFigure, as the headless exporter draws it):
   * the fits in table order, four to a figure (more would not stay readable in print).
   */
  paperFigures(): FigureSpec[] {
    const x = this.model.get("x") as ShapedArray<Float64Array> | null;
    const y = this.model.get("y") as ShapedArray<Float64Array> | null;
    const curves = this.model.get("curves") as ShapedArray<Float64Array> | null;
    const resid = this.model.get("residuals") as ShapedArray<Float64Array> | null;
    const table = this.model.get("table") as ComparisonRow[];
    if (!x || !y || !curves || !resid || table.length === 0) return [];
    const profile = { x: Float64Array.from(x.data), y: Float64Array.from(y.data), yUnit: this.model.get("y_unit") as string, counts: false };
    const fits = table.map((r, i) => ({ label: r.label, result: { modelId: r.modelId, model: row(curves, i), residuals: row(resid, i) } }));
    return groupsOf(fits, 4).map((group) => comparisonFigure(profile, group));
  }

  override render(): void {
    this.buildFrame(this.model.get("title") as string, 420);
    this.tableEl = h("div", { class: "fk-side", "data-region": "comparison-table" });
    this.root.append(h("div", { class: "fk-body" }, this.plotEl, this.tableEl));
    this.listenTo(this.model, "change", () => this.update());
    this.update();
  }

  override update(): void {
    const table = this.model.get("table") as ComparisonRow[];
    const best = table.reduce((b, r, i) => (r.aic < (table[b]?.aic ?? Infinity) ? i : b), 0);
    setChildren(this.tableEl,
      h("div", { class: "fk-verdict", "data-region": "verdict" }, this.model.get("verdict") as string),
      h("div", { class: "fk-scroll" }, h("table", { class: "fk-table" },
        h("thead", {}, h("tr", {}, ...["model", "k", "χ²ᵣ", "ΔAIC", "weight"].map((t) => h("th", {}, t)))),
        h("tbody", {}, ...table.map((r, i) => h("tr", { class: i === best ? "fk-best" : undefined, title: `AIC ${formatNumber(r.aic, 7)}, BIC ${formatNumber(r.bic, 7)}` },
          h("td", {}, h("span", { class: "fk-swatch", style: `background:${palette.series[i % palette.series.length]}` }), r.label + (r.converged ? "" : " (not converged)")),
          h("td", {}, String(r.k)),
          h("td", {}, fixedOrExp(r.reducedChi2, 3)),
          h("td", {}, fixedOrExp(r.deltaAic, 1)),
          h("td", {}, r.weight.toFixed(3))))))),
      h("div", { class: "fk-status" }, "k free parameters; χ²ᵣ reduced χ²; ΔAIC to the lowest AIC; weight = Akaike weight. Hover a row for AIC and BIC."));
    void this.draw(table);
  }

  protected redrawAll(): void {
    void this.draw(this.model.get("table") as ComparisonRow[]);
  }

  private async draw(table: ComparisonRow[]): Promise<void> {
    const x = this.model.get("x") as ShapedArray<Float64Array> | null;
    const y = this.model.get("y") as ShapedArray<Float64Array> | null;
    const curves = this.model.get("curves") as ShapedArray<Float64Array> | null;
    const resid = this.model.get("residuals") as ShapedArray<Float64Array> | null;
    if (!x || !y) return;
    const n = x.data.length;
    const unit = displayUnitFor("m", Math.max(Math.abs(x.data[0]!), Math.abs(x.data[n - 1]!)));
    const xs = x.data.map((v) => v * unit.factor);
    const data: Record<string, unknown>[] = [
      { type: "scatter", mode: "markers", name: "data", x: xs, y: y.data, marker: { color: palette.data, size: n > 3000 ? 2.5 : 4, opacity: 0.6 }, hoverinfo: "x+y" },
    ];
    table.forEach((r, i) => {
      const color = palette.series[i % palette.series.length];
      if (curves) data.push({ type: "scatter", mode: "lines", name: r.label, legendgroup: r.label, x: xs, y: row(curves, i), line: { color, width: 1.6 } });
      if (resid) data.push({ type: "scatter", mode: "lines", name: r.label, legendgroup: r.label, showlegend: false, x: xs, y: row(resid, i), yaxis: "y2", line: { color, width: 1 }, opacity: 0.85 });
    });
    await this.drawFigure(data, baseLayout({
      xaxis: axis(`position (${unit.label})`, { anchor: "y2" }),
      yaxis: axis(`intensity (${this.model.get("y_unit")})`, { domain: [0.34, 1] }),
      yaxis2: axis("residual / σ", { domain: [0, 0.26] }),
      height: 420,
      uirevision: "keep",
    }));
  }
}
