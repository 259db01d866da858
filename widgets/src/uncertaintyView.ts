/**
 * Uncertainty view: one profile-likelihood panel per parameter (Δ(−2 ln L) against the value,
 * the interval threshold and the best fit marked) and the correlation matrix as a heat map.
 */
import Plotly from "plotly.js-dist-min";
import { correlationFigure } from "../../src/report/figures/correlationFigure.js";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { profileLikelihoodFigure } from "../../src/report/figures/profileLikelihoodFigure.js";
import { row, type ShapedArray } from "./arrayWire.js";
import { h, setChildren } from "./dom.js";
import { displayUnitFor, formatNumber } from "./displayUnits.js";
import { axis, baseLayout, FigureView, plotConfig } from "./figureView.js";
import type { ProfiledParameter } from "./uncertaintyModel.js";
import { groupsOf } from "./paperExport.js";
import { palette } from "./styles.js";

export class UncertaintyView extends FigureView {
  private corrEl!: HTMLDivElement;
  private listEl!: HTMLDivElement;

  protected exportName(): string {
    return "fringekit-uncertainty";
  }

  protected override exportTargets(): HTMLElement[] {
    return this.corrEl ? [this.plotEl, this.corrEl] : [this.plotEl];
  }

  /**
   * Paper figures of the current state, as the headless exporter draws them: the
   * profile-likelihood panels (profileLikelihoodFigure, four parameters to a figure), then the
   * correlation matrix (correlationFigure) when there are two or more free parameters.
   */
  paperFigures(): FigureSpec[] {
    const params = this.model.get("parameters") as ProfiledParameter[];
    const grid = this.model.get("grid") as ShapedArray<Float64Array> | null;
    const delta = this.model.get("delta") as ShapedArray<Float64Array> | null;
    const figures: FigureSpec[] = [];
    if (grid && delta && params.length > 0) {
      const curves = params.map((p, i) => ({
        name: p.name, unit: p.unit, values: row(grid, i), deltaObjective: row(delta, i), best: p.best,
        ...(p.uncertainty !== null ? { uncertainty: p.uncertainty } : {}),
      }));
      for (const group of groupsOf(curves, 4)) figures.push(profileLikelihoodFigure(group));
    }
    const names = this.model.get("free_names") as string[];
    const corr = this.model.get("correlation") as ShapedArray<Float64Array> | null;
    if (corr && names.length >= 2) {
      figures.push(correlationFigure({ modelId: (this.model.get("model_id") as string | undefined) ?? "", freeNames: names, correlation: Float64Array.from(corr.data) }));
    }
    return figures;
  }

  override render(): void {
    this.buildFrame(this.model.get("title") as string, 360);
    this.corrEl = h("div", { class: "fk-plot", style: "min-height:300px", "data-region": "correlation" });
    this.listEl = h("div", { "data-region": "intervals" });
    this.root.append(h("div", { class: "fk-body fk-wide-side" }, this.plotEl, h("div", { class: "fk-side" }, this.corrEl, this.listEl)));
    this.listenTo(this.model, "change", () => this.update());
    this.update();
  }

  override update(): void {
    void this.draw();
  }

  protected override resized(): void {
    void this.draw();
  }

  protected redrawAll(): void {
    void this.draw();
  }

  private async draw(): Promise<void> {
    const params = this.model.get("parameters") as ProfiledParameter[];
    const grid = this.model.get("grid") as ShapedArray<Float64Array> | null;
    const delta = this.model.get("delta") as ShapedArray<Float64Array> | null;
    const threshold = Number(this.model.get("threshold"));
    const level = Number(this.model.get("level"));
    const p = params.length;
    const cols = Math.min(p, this.plotEl.clientWidth > 0 && this.plotEl.clientWidth < 520 ? 1 : 2) || 1;
    const rows = Math.ceil(p / cols);
    const data: Record<string, unknown>[] = [];
    const layout: Record<string, unknown> = {};
    const shapes: Record<string, unknown>[] = [];
    const gap = 0.12;
    const listRows: HTMLElement[] = [];
    params.forEach((param, i) => {
      const unit = displayUnitFor(param.unit, param.best);
      const c = i % cols;
      const r = Math.floor(i / cols);
      const ax = i === 0 ? "" : String(i + 1);
      const x0 = c / cols + (c > 0 ? gap / 2 : 0);
      const x1 = (c + 1) / cols - (c < cols - 1 ? gap / 2 : 0);
      const y1 = 1 - r / rows - (r > 0 ? 0.04 : 0);
      const y0 = 1 - (r + 1) / rows + 0.1 / rows + 0.05;
      if (grid && delta) {
        data.push({ type: "scatter", mode: "lines+markers", x: row(grid, i).map((v) => v * unit.factor), y: row(delta, i), xaxis: `x${ax}`, yaxis: `y${ax}`,
          line: { color: palette.fit, width: 1.6 }, marker: { size: 3, color: palette.fit }, name: param.name, showlegend: false });
      }
      layout[`xaxis${ax}`] = axis(`${param.name}${unit.label ? ` (${unit.label})` : ""}`, { domain: [x0, x1], anchor: `y${ax}` });
      layout[`yaxis${ax}`] = axis(c === 0 ? "Δ(−2 ln L)" : "", { domain: [y0, y1], anchor: `x${ax}`, rangemode: "tozero" });
      shapes.push({ type: "line", xref: `x${ax} domain`, yref: `y${ax}`, x0: 0, x1: 1, y0: threshold, y1: threshold, line: { color: palette.model, width: 1, dash: "dash" } });
      shapes.push({ type: "line", xref: `x${ax}`, yref: `y${ax} domain`, x0: param.best * unit.factor, x1: param.best * unit.factor, y0: 0, y1: 1, line: { color: palette.muted, width: 1, dash: "dot" } });
      const [lo, hi] = param.interval;
      if (lo !== null && hi !== null) {
        shapes.push({ type: "rect", xref: `x${ax}`, yref: `y${ax} domain`, x0: lo * unit.factor, x1: hi * unit.factor, y0: 0, y1: 1, fillcolor: palette.band, line: { width: 0 }, layer: "below" });
      }
      const fmt = (v: number | null) => (v === null ? "open" : formatNumber(v * unit.factor, 5));
      listRows.push(h("tr", { "data-param": param.name },
        h("td", {}, param.name), h("td", {}, fmt(lo)), h("td", {}, fmt(param.best)), h("td", {}, fmt(hi)), h("td", {}, unit.label)));
    });
    await this.drawFigure(data, baseLayout({ ...layout, shapes, showlegend: false, height: Math.max(260, rows * 200), margin: { l: 60, r: 12, t: 10, b: 40 } }));
    setChildren(this.listEl,
      h("div", { class: "fk-section" }, h("h4", {}, `Profile-likelihood intervals (${formatNumber(level * 100, 4)} %)`),
        h("div", { class: "fk-scroll" }, h("table", { class: "fk-table" },
          h("thead", {}, h("tr", {}, ...["parameter", "lower", "best", "upper", "unit"].map((t) => h("th", {}, t)))),
          h("tbody", {}, ...listRows)))));
    await this.drawCorrelation();
  }

  private async drawCorrelation(): Promise<void> {
    const names = this.model.get("free_names") as string[];
    const corr = this.model.get("correlation") as ShapedArray<Float64Array> | null;
    // Not in the page yet: drawn with the rest when the view gets its width (redrawAll).
    if (!corr || names.length === 0 || !this.isShown()) return;
    const k = names.length;
    const z: number[][] = [];
    const text: string[][] = [];
    for (let i = 0; i < k; i++) {
      z.push(Array.from(row(corr, i)));
      text.push(z[i]!.map((v) => v.toFixed(2)));
    }
    await Plotly.react(this.corrEl, [{
      type: "heatmap", x: names, y: names, z, text, texttemplate: "%{text}", zmin: -1, zmax: 1,
      colorscale: [[0, "#1d4ed8"], [0.5, "#f8fafc"], [1, "#c2410c"]], colorbar: { thickness: 10, len: 0.9 },
      hovertemplate: "%{y} · %{x}: %{z:.3f}<extra></extra>",
    }], baseLayout({ width: this.corrEl.clientWidth || 400, height: 300, margin: { l: 90, r: 10, t: 24, b: 70 }, yaxis: { autorange: "reversed", automargin: true }, xaxis: { automargin: true, tickangle: -40 },
      title: { text: "correlation", font: { size: 12 }, x: 0.02 }, showlegend: false }), plotConfig);
  }
}
