/**
 * Profile explorer view: recorded profile with the model on top and residuals below, one row
 * of controls per parameter, drag-to-mask and fit-window selection, a Fit action with progress
 * and cancel, and the fitted values beside the plot. Slider moves recompute the model here in
 * the browser with fringekit's own physics code; only Fit goes to the kernel.
 */
import type { Model } from "../../src/physics/model.js";
import type { Profile } from "../../src/profile.js";
import { fitFigure } from "../../src/report/figures/fitFigure.js";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import type { ShapedArray } from "./arrayWire.js";
import { modelFor, modelIds } from "../shared/catalog.js";
import { residualAxisTitle, residualScale, type ResidualScale } from "../../src/fit/residualScale.js";
import { h, setChildren } from "./dom.js";
import { displayUnitFor, formatNumber, formatWithUncertainty } from "./displayUnits.js";
import { readFitJson, type FitJson } from "../../src/report/results/fitJson.js";
import { axis, baseLayout, FigureView } from "./figureView.js";
import { ParamRow } from "./paramRow.js";
import { effectiveMask, paramsForModel, paramVector, residuals, type ParamState } from "../shared/preview.js";
import { drawOverlay, type OverlayBand, type OverlaySeries } from "./overlay.js";
import { palette } from "./styles.js";
import Plotly from "plotly.js-dist-min";

type DragMode = "zoom" | "mask" | "window";

/** A fitter the page provides when no kernel is attached (the static export runs one in a Web Worker). */
export interface LocalFitter {
  fit(request: LocalFitRequest, onProgress: (fraction: number, message: string) => void, signal: AbortSignal): Promise<{ summary: FitJson; curve: Float64Array; params: Record<string, ParamState> }>;
}

/** Everything a fit needs, as the explorer holds it. */
export interface LocalFitRequest {
  x: Float64Array;
  y: Float64Array;
  sigma: Float64Array | null;
  mask: Uint8Array;
  counts: boolean;
  modelId: string;
  /** Model options (e.g. { smallAngle: true }): the page fits exactly the model shown. */
  modelOptions: Record<string, unknown>;
  noise: string;
  params: Record<string, ParamState>;
}

export class ExplorerView extends FigureView {
  /** Set by the static-page renderer; used when the model has no kernel. */
  static localFitter: LocalFitter | null = null;

  private modelDef: Model | null = null;
  private rows = new Map<string, ParamRow>();
  private live: Record<string, ParamState> = {};
  private paramsEl!: HTMLDivElement;
  private resultEl!: HTMLDivElement;
  private statusEl!: HTMLDivElement;
  private progressBar!: HTMLDivElement;
  private fitButton!: HTMLButtonElement;
  private cancelButton!: HTMLButtonElement;
  private modelSelect!: HTMLSelectElement;
  private noiseSelect!: HTMLSelectElement;
  private modeButtons = new Map<DragMode, HTMLButtonElement>();
  private dragMode: DragMode = "zoom";
  private xShown = new Float64Array(0);
  private used: Uint8Array = new Uint8Array(0);
  private curve = new Float64Array(0);
  private resid = new Float64Array(0);
  private pvec = new Float64Array(0);
  private drawing = false;
  private removed = false;
  private overlay!: HTMLCanvasElement;
  /** Canvas under the (transparent) plotly figure with the data markers. */
  private dataLayer!: HTMLCanvasElement;
  private usedY = new Float64Array(0);
  private excludedY = new Float64Array(0);
  private markerSize = 5;
  private pendingInputTime = 0;
  private localAbort: AbortController | null = null;
  private boundsOpen = false;

  protected exportName(): string {
    return `fringekit-explorer-${this.model.get("model_id") || "profile"}`;
  }

  override render(): void {
    this.buildFrame(this.model.get("title") as string, 440);
    this.modelSelect = h("select", { "aria-label": "Model", "data-control": "model" });
    this.noiseSelect = h("select", { "aria-label": "Noise model", "data-control": "noise" });
    for (const [value, label] of [["auto", "auto"], ["gaussian", "Gaussian"], ["poisson", "Poisson"], ["robust", "robust"]]) {
      this.noiseSelect.append(h("option", { value }, label));
    }
    const modes = h("span", { class: "fk-seg", role: "group", "aria-label": "Drag on the plot to" });
    for (const [mode, label, title] of [
      ["zoom", "Zoom", "Drag to zoom"],
      ["mask", "Mask", "Drag across the plot to exclude a region from the fit"],
      ["window", "Window", "Drag across the plot to set the fit window"],
    ] as const) {
      const button = h("button", { type: "button", title, "aria-pressed": String(mode === "zoom"), "data-mode": mode }, label);
      button.addEventListener("click", () => this.setDragMode(mode));
      this.modeButtons.set(mode, button);
      modes.append(button);
    }
    const clear = h("button", { type: "button", title: "Remove masked regions and the fit window", "data-action": "clear-mask" }, "Clear");
    clear.addEventListener("click", () => {
      this.model.set({ masked_ranges: [], window: null });
      this.model.save_changes();
    });
    this.fitButton = h("button", { type: "button", class: "fk-primary", "data-action": "fit" }, "Fit");
    this.cancelButton = h("button", { type: "button", "data-action": "cancel", disabled: true }, "Cancel");
    this.fitButton.addEventListener("click", () => this.startFit());
    this.cancelButton.addEventListener("click", () => this.cancelFit());
    this.head.insertBefore(
      h("span", { class: "fk-head", style: "margin:0" },
        h("label", {}, "model", this.modelSelect),
        h("label", {}, "noise", this.noiseSelect),
        modes, clear, this.fitButton, this.cancelButton),
      this.head.lastChild,
    );
    this.modelSelect.addEventListener("change", () => this.chooseModel(this.modelSelect.value));
    this.noiseSelect.addEventListener("change", () => {
      this.model.set("noise", this.noiseSelect.value);
      this.model.save_changes();
      this.schedulePreview(performance.now());
    });

    this.progressBar = h("div", {});
    this.statusEl = h("div", { class: "fk-status", role: "status", "aria-live": "polite" });
    this.paramsEl = h("div", { "data-region": "parameters" });
    this.resultEl = h("div", { "data-region": "result" });
    const boundsToggle = h("input", { type: "checkbox", "aria-label": "show bounds" });
    boundsToggle.addEventListener("change", () => {
      this.boundsOpen = boundsToggle.checked;
      for (const row of this.rows.values()) row.showBounds(this.boundsOpen);
    });
    const side = h("div", { class: "fk-side" },
      h("div", { class: "fk-progress", "aria-hidden": "true" }, this.progressBar),
      this.statusEl,
      h("div", { class: "fk-section" },
        h("h4", {}, "Parameters"),
        h("div", { class: "fk-param-head" }, h("span", {}, "name"), h("span", {}, "value"),
          h("label", { style: "justify-self:end" }, boundsToggle, "bounds"), h("span", { title: "fixed" }, "fix")),
        this.paramsEl),
      h("div", { class: "fk-section" }, h("h4", {}, "Fit result"), this.resultEl));
    this.overlay = h("canvas", { class: "fk-overlay", "aria-hidden": "true" });
    this.dataLayer = h("canvas", { class: "fk-datalayer", "aria-hidden": "true" });
    this.root.append(h("div", { class: "fk-body" }, h("div", { class: "fk-plotwrap" }, this.dataLayer, this.plotEl, this.overlay), side));

    this.listenTo(this.model, "change:x change:y change:sigma change:mask change:counts", () => this.rebuildData());
    this.listenTo(this.model, "change:model_id change:model_choices", () => this.rebuildModel());
    this.listenTo(this.model, "change:params", () => this.syncParams());
    this.listenTo(this.model, "change:noise", () => {
      this.noiseSelect.value = this.model.get("noise");
      this.schedulePreview(performance.now());
    });
    this.listenTo(this.model, "change:window change:masked_ranges", () => this.rebuildData());
    this.listenTo(this.model, "change:fit_state change:fit_progress change:fit_message", () => this.showStatus());
    this.listenTo(this.model, "change:result", () => this.showResult());
    this.listenTo(this.model, "change:fit_curve", () => void this.redraw());

    this.plotEl.addEventListener("keydown", (event) => {
      if (event.key === "Escape") this.setDragMode("zoom");
    });
    this.rebuildModel();
    this.showStatus();
    this.showResult();
  }

  /** Current parameter values as the sliders show them (SI). */
  get liveParams(): Record<string, ParamState> {
    return structuredClone(this.live);
  }

  private array(name: string): ShapedArray<any> | null {
    return this.model.get(name) as ShapedArray<any> | null;
  }

  private setDragMode(mode: DragMode): void {
    this.dragMode = mode;
    for (const [m, button] of this.modeButtons) button.setAttribute("aria-pressed", String(m === mode));
    if (this.plotEl.childElementCount > 0) {
      void Plotly.relayout(this.plotEl, { dragmode: mode === "zoom" ? "zoom" : "select", selections: [] });
    }
  }

  private chooseModel(id: string): void {
    const model = modelFor(id, this.model.get("model_options"));
    this.model.set({ model_id: id, params: paramsForModel(model, this.model.get("params")) });
    this.model.save_changes();
  }

  private rebuildModel(): void {
    const ids = (this.model.get("model_choices") as string[]).length > 0 ? (this.model.get("model_choices") as string[]) : modelIds();
    const id = (this.model.get("model_id") as string) || ids[0] || "";
    setChildren(this.modelSelect, ...ids.map((m) => h("option", { value: m, selected: m === id }, m)));
    this.modelSelect.value = id;
    this.noiseSelect.value = this.model.get("noise");
    this.rows.clear();
    setChildren(this.paramsEl);
    this.modelDef = null;
    if (!id) return;
    try {
      this.modelDef = modelFor(id, this.model.get("model_options"));
    } catch (error) {
      this.statusEl.textContent = (error as Error).message;
      this.statusEl.classList.add("fk-bad");
      return;
    }
    this.live = paramsForModel(this.modelDef, this.model.get("params"));
    this.pvec = new Float64Array(this.modelDef.parameters.length);
    for (const spec of this.modelDef.parameters) {
      const row = new ParamRow(spec, this.live[spec.name]!, {
        preview: (name, value) => {
          this.live[name]!.value = value;
          this.schedulePreview(performance.now());
        },
        commit: (name, state) => {
          this.live[name] = state;
          this.model.set("params", { ...(this.model.get("params") as Record<string, ParamState>), [name]: { ...state } });
          this.model.save_changes();
        },
      });
      row.showBounds(this.boundsOpen);
      this.rows.set(spec.name, row);
      this.paramsEl.append(row.element);
    }
    this.rebuildData();
  }

  private syncParams(): void {
    if (this.modelDef === null) return;
    const incoming = paramsForModel(this.modelDef, this.model.get("params"));
    for (const [name, state] of Object.entries(incoming)) {
      this.live[name] = state;
      this.rows.get(name)?.update(state);
    }
    this.schedulePreview(performance.now());
    this.fitResidualAxis();
  }

  /**
   * Settled parameters (a fit arrived, a slider was released): rescale the residual axis when
   * the residuals left it or shrank well inside it, e.g. from ±80 before a fit to ±4 after.
   */
  private fitResidualAxis(): void {
    if (!this.computePreview() || this.plotEl.childElementCount === 0) return;
    const wanted = this.residualRange();
    const current = (this.plotEl as unknown as { _fullLayout?: { yaxis2?: { range?: [number, number] } } })._fullLayout?.yaxis2?.range;
    if (!current) return;
    const span = (r: [number, number]) => r[1] - r[0];
    if (wanted[0] < current[0] || wanted[1] > current[1] || span(wanted) < 0.3 * span(current)) {
      void Plotly.relayout(this.plotEl, { "yaxis2.range": wanted });
    }
  }

  private rebuildData(): void {
    const x = this.array("x");
    const n = x ? x.data.length : 0;
    this.xShown = new Float64Array(n);
    const xUnit = displayUnitFor("m", x && n > 0 ? Math.max(Math.abs(x.data[0]), Math.abs(x.data[n - 1])) : 1e-3);
    for (let i = 0; i < n; i++) this.xShown[i] = x!.data[i] * xUnit.factor;
    this.xFactor = xUnit.factor;
    this.xLabel = xUnit.label;
    this.curve = new Float64Array(n);
    this.resid = new Float64Array(n);
    this.used = x ? effectiveMask(x.data, this.array("mask")?.data ?? null, this.model.get("window"), this.model.get("masked_ranges")) : new Uint8Array(0);
    void this.redraw();
  }

  private xFactor = 1e3;
  private xLabel = "mm";

  /** What residuals are divided by: the same choice the fitter makes for this noise model and data. */
  private residualKind(): ResidualScale {
    return residualScale(this.model.get("noise") as string, this.array("sigma") !== null, this.model.get("counts") === true);
  }

  /** Evaluate the model for the live parameter values into this.curve and this.resid. */
  private computePreview(): boolean {
    const x = this.array("x");
    const y = this.array("y");
    if (!x || !y || this.modelDef === null || this.curve.length !== x.data.length) return false;
    paramVector(this.modelDef, this.live, this.pvec);
    this.modelDef.evaluate(x.data, this.pvec, this.curve);
    residuals(y.data, this.curve, this.array("sigma")?.data ?? null, this.residualKind(), this.used, this.resid);
    return true;
  }

  /**
   * Redraw at once for an input; inputs arriving while a redraw runs are coalesced into one
   * more redraw when it ends (the curve never lags more than one update behind the slider).
   */
  private schedulePreview(inputTime: number): void {
    if (this.drawing) {
      if (this.pendingInputTime === 0) this.pendingInputTime = inputTime;
      return;
    }
    this.drawing = true;
    void this.updatePreview(inputTime).finally(() => {
      this.drawing = false;
      const pending = this.pendingInputTime;
      this.pendingInputTime = 0;
      if (pending !== 0 && !this.removed) this.schedulePreview(pending);
    });
  }

  private async updatePreview(since: number): Promise<void> {
    if (!this.computePreview() || this.plotEl.childElementCount === 0) return;
    this.paintOverlay();
    this.el.dispatchEvent(new CustomEvent("fk-redraw", { detail: { since, done: performance.now() } }));
  }

  /**
   * Draw the data markers on the canvas under the figure, for the traces the legend shows
   * (plotly keeps the same points as invisible traces for hover and box selection).
   */
  private paintData(): void {
    const shown = (index: number) => (this.plotEl as unknown as { _fullData?: { visible?: unknown }[] })._fullData?.[index]?.visible === true;
    const series: OverlaySeries[] = [];
    if (shown(0)) series.push({ x: this.xShown, y: this.usedY, yaxis: "yaxis", color: palette.data, style: "markers", width: this.markerSize, opacity: 0.75 });
    if (shown(1)) series.push({ x: this.xShown, y: this.excludedY, yaxis: "yaxis", color: palette.masked, style: "markers", width: this.markerSize });
    // Masked ranges and the fit window are shaded here too, under their points.
    const bands: OverlayBand[] = (this.model.get("masked_ranges") as [number, number][]).map(([a, b]) => ({ x0: a * this.xFactor, x1: b * this.xFactor, fill: palette.maskShade }));
    const window = this.model.get("window") as [number, number] | null;
    if (window) bands.push({ x0: window[0] * this.xFactor, x1: window[1] * this.xFactor, fill: palette.windowShade, outline: palette.fit });
    drawOverlay(this.dataLayer, this.plotEl, series, bands);
  }

  /** Draw the slider-driven model curve and residuals on the canvas layer. */
  private paintOverlay(): void {
    drawOverlay(this.overlay, this.plotEl, [
      { x: this.xShown, y: this.curve, yaxis: "yaxis", color: palette.model, style: "line", width: 1.8 },
      { x: this.xShown, y: this.resid, yaxis: "yaxis2", color: palette.residual, style: "points", width: 2.2 },
    ]);
  }

  /**
   * The paper figure of the current state: the profile with the current mask and window, and
   * the fitted curve when a fit has arrived, else the slider model (legend "model (sliders)"),
   * with normalised residuals below (fitFigure, as the headless exporter draws it).
   */
  paperFigures(): FigureSpec[] {
    const x = this.array("x");
    const y = this.array("y");
    if (!x || !y) return [];
    const n = x.data.length;
    const sigma = this.array("sigma")?.data ?? null;
    const fit = this.array("fit_curve");
    const summary = this.model.get("result") as FitJson | null;
    const fitted = fit !== null && fit.data.length === n && summary !== null;
    let curve: Float64Array;
    if (fitted) curve = Float64Array.from(fit.data);
    else {
      this.computePreview();
      curve = this.curve.slice();
    }
    const used = this.used.length === n ? this.used.slice() : new Uint8Array(n).fill(1);
    const resid = residuals(y.data as Float64Array, curve, sigma as Float64Array | null, this.residualKind(), used, new Float64Array(n));
    const profile: Profile = {
      x: Float64Array.from(x.data), y: Float64Array.from(y.data), mask: used,
      yUnit: this.model.get("y_unit") as string, counts: this.model.get("counts") === true,
      ...(sigma ? { sigma: Float64Array.from(sigma) } : {}),
    };
    const modelId = fitted ? summary.modelId : (this.model.get("model_id") as string);
    return [fitFigure(profile, { modelId, model: curve, residuals: resid }, { residualScale: this.residualKind(), ...(fitted ? {} : { modelLabel: "model (sliders)" }) })];
  }

  private async redraw(): Promise<void> {
    const x = this.array("x");
    const y = this.array("y");
    if (!x || !y) return;
    this.computePreview();
    const n = x.data.length;
    const usedY = new Float64Array(n);
    const excludedY = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      usedY[i] = this.used[i] === 1 ? y.data[i] : NaN;
      excludedY[i] = this.used[i] === 1 ? NaN : y.data[i];
    }
    this.usedY = usedY;
    this.excludedY = excludedY;
    const fit = this.array("fit_curve");
    const yUnit = this.model.get("y_unit") as string;
    const markerSize = n > 3000 ? 2.5 : n > 800 ? 3.5 : 5;
    this.markerSize = markerSize;
    // The data and excluded points are painted on the canvas under the figure (paintData):
    // plotly keeps them as invisible markers (one drawn, maxdisplayed) for hover, autorange and
    // box selection, and a legend entry per group shows and hides them.
    const hidden = { size: markerSize, opacity: 0, maxdisplayed: 1 };
    const data: Record<string, unknown>[] = [
      { type: "scatter", mode: "markers", name: "data", legendgroup: "data", showlegend: false, x: this.xShown, y: usedY, marker: { ...hidden, color: palette.data }, hoverinfo: "x+y" },
      { type: "scatter", mode: "markers", name: "excluded", legendgroup: "excluded", showlegend: false, x: this.xShown, y: excludedY, marker: { ...hidden, color: palette.masked }, hoverinfo: "skip" },
      // Legend entries only: the live curve and residuals are painted on the canvas layer.
      { type: "scatter", mode: "lines", name: "model (sliders)", x: [null], y: [null], line: { color: palette.model, width: 1.8 }, hoverinfo: "skip", legendrank: 3 },
      { type: "scatter", mode: "lines", name: "fit", x: this.xShown, y: fit ? fit.data : [], line: { color: palette.fit, width: 1.5, dash: "dash" }, visible: fit ? true : "legendonly", showlegend: fit !== null, hoverinfo: "skip", legendrank: 4 },
      { type: "scatter", mode: "markers", name: "residual", x: [null], y: [null], xaxis: "x", yaxis: "y2", marker: { color: palette.residual, size: 2.5 }, showlegend: false, hoverinfo: "skip" },
      { type: "scatter", mode: "markers", name: "data", legendgroup: "data", x: [null], y: [null], marker: { color: palette.data, size: markerSize, opacity: 0.75 }, hoverinfo: "skip", legendrank: 1 },
      { type: "scatter", mode: "markers", name: "excluded", legendgroup: "excluded", x: [null], y: [null], marker: { color: palette.masked, size: markerSize }, showlegend: this.used.includes(0), hoverinfo: "skip", legendrank: 2 },
    ];
    const residualLabel = residualAxisTitle(this.residualKind());
    const drawn = await this.drawFigure(data, baseLayout({
      // Room for the legend above and the axis titles: plotly draws the figure a second time
      // when its axes push the margins out (automargin stays on for wider tick labels).
      margin: { l: 70, r: 16, t: 52, b: 52 },
      paper_bgcolor: "rgba(0,0,0,0)",
      plot_bgcolor: "rgba(0,0,0,0)",
      dragmode: this.dragMode === "zoom" ? "zoom" : "select",
      selectdirection: "h",
      xaxis: axis(`position (${this.xLabel})`, { anchor: "y2" }),
      yaxis: axis(`intensity (${yUnit})`, { domain: [0.3, 1] }),
      yaxis2: axis(residualLabel, { domain: [0, 0.22], zeroline: true, range: this.residualRange() }),
      uirevision: "keep",
      height: this.plotHeight(),
    }));
    if (!drawn) return;
    const plot = this.plotEl as unknown as { removeAllListeners?: (e: string) => void; on: (e: string, f: (d: any) => void) => void };
    plot.removeAllListeners?.("plotly_selected");
    plot.removeAllListeners?.("plotly_afterplot");
    plot.on("plotly_selected", (event: { range?: { x?: [number, number] } } | undefined) => this.onSelected(event));
    plot.on("plotly_afterplot", () => {
      this.paintData();
      this.paintOverlay();
    });
    this.paintData();
    this.paintOverlay();
    this.el.dispatchEvent(new CustomEvent("fk-redraw", { detail: { since: 0, done: performance.now() } }));
  }

  protected redrawAll(): void {
    void this.redraw();
  }

  protected override resized(): void {
    const height = this.plotHeight();
    const current = (this.plotEl as unknown as { _fullLayout?: { height?: number } })._fullLayout?.height;
    if (current !== height) void Plotly.relayout(this.plotEl, { height });
    else void Plotly.Plots.resize(this.plotEl);
  }

  /** Figure height (px): tall beside the parameter column, shorter when the column sits below. */
  private plotHeight(): number {
    return this.root.clientWidth > 760 ? 600 : 460;
  }

  /** Residual axis range from the residuals at draw time (plotly cannot autorange canvas points). */
  private residualRange(): [number, number] {
    let lo = Infinity;
    let hi = -Infinity;
    for (const r of this.resid) {
      if (r < lo) lo = r;
      if (r > hi) hi = r;
    }
    if (!(hi > lo)) return [-3, 3];
    const pad = 0.08 * (hi - lo);
    return [Math.min(lo - pad, -3), Math.max(hi + pad, 3)];
  }

  private onSelected(event: { range?: { x?: [number, number] } } | undefined): void {
    const range = event?.range?.x;
    if (!range || this.dragMode === "zoom") return;
    const si: [number, number] = [Math.min(range[0], range[1]) / this.xFactor, Math.max(range[0], range[1]) / this.xFactor];
    if (this.dragMode === "mask") {
      this.model.set("masked_ranges", [...(this.model.get("masked_ranges") as [number, number][]), si]);
    } else {
      this.model.set("window", si);
    }
    this.model.save_changes();
  }

  private showStatus(): void {
    const state = this.model.get("fit_state") as string;
    const progress = Number(this.model.get("fit_progress")) || 0;
    const message = this.model.get("fit_message") as string;
    const running = state === "running";
    this.fitButton.disabled = running;
    this.cancelButton.disabled = !running;
    this.progressBar.style.width = `${Math.round((running ? progress : state === "done" ? 1 : 0) * 100)}%`;
    this.statusEl.classList.toggle("fk-bad", state === "failed");
    this.statusEl.textContent = message || (running ? "fitting…" : "Move the sliders to explore; Fit refines the free parameters.");
    this.root.dataset.fitState = state;
  }

  private showResult(): void {
    const stored = this.model.get("result") as unknown;
    if (stored === null || stored === undefined) {
      setChildren(this.resultEl, h("div", { class: "fk-status" }, "No fit yet."));
      return;
    }
    // The one JSON shape of a fit; notebooks saved before it hold a `parameters` list, read alike.
    const result = readFitJson(stored, "explorer result");
    const rows = Object.entries(result.params).map(([name, p]) => {
      const unit = this.rows.get(name)?.unit ?? displayUnitFor(p.unit, p.value);
      const shown = p.fixed
        ? `${formatNumber(p.value * unit.factor)} (fixed)`
        : !Number.isFinite(p.uncertainty) ? `${formatNumber(p.value * unit.factor)} ± ?` : formatWithUncertainty(p.value * unit.factor, p.uncertainty * unit.factor);
      return h("tr", { "data-param": name }, h("td", {}, name), h("td", {}, shown + (p.atBound ? ` ⚑ ${p.atBound}` : "")), h("td", {}, unit.label));
    });
    const s = result.statistics as Record<string, number>;
    setChildren(this.resultEl,
      h("div", { class: result.converged ? "fk-status" : "fk-status fk-bad" }, `${result.converged ? "converged" : "not converged"}: ${result.message}`),
      h("div", { class: "fk-scroll" }, h("table", { class: "fk-table" },
        h("thead", {}, h("tr", {}, h("th", {}, "parameter"), h("th", {}, "value ± std. unc."), h("th", {}, "unit"))),
        h("tbody", {}, ...rows))),
      h("table", { class: "fk-table", style: "margin-top:4px" }, h("tbody", {},
        h("tr", {}, h("td", {}, "χ² / dof"), h("td", {}, `${formatNumber(s.chi2, 6)} / ${s.dof}`)),
        h("tr", {}, h("td", {}, "reduced χ²"), h("td", { "data-stat": "reducedChi2" }, Number.isFinite(s.reducedChi2) ? s.reducedChi2.toFixed(3) : "—")),
        h("tr", {}, h("td", {}, "points used, free params"), h("td", {}, `${s.n}, ${s.nFree}`)),
        h("tr", {}, h("td", {}, "AIC, BIC"), h("td", {}, `${formatNumber(s.aic, 6)}, ${formatNumber(s.bic, 6)}`)),
        h("tr", {}, h("td", {}, "noise model"), h("td", {}, result.noise)))),
      ...result.warnings.map((w) => h("div", { class: "fk-warn" }, w.message)));
  }

  private startFit(): void {
    this.model.set("params", structuredClone(this.live));
    this.model.save_changes();
    if ((this.model as unknown as { hasKernel: boolean }).hasKernel) {
      this.send({ action: "fit" });
      return;
    }
    void this.fitInPage();
  }

  private cancelFit(): void {
    if ((this.model as unknown as { hasKernel: boolean }).hasKernel) {
      this.send({ action: "cancel" });
      return;
    }
    this.localAbort?.abort();
  }

  /** No kernel (static page): run the page's fitter and write its result into the model. */
  private async fitInPage(): Promise<void> {
    const fitter = ExplorerView.localFitter;
    if (fitter === null) {
      this.model.set({ fit_state: "failed", fit_message: "No kernel and no in-page fitter: open this notebook in Jupyter to fit." });
      return;
    }
    const x = this.array("x")!;
    const y = this.array("y")!;
    this.localAbort = new AbortController();
    this.model.set({ fit_state: "running", fit_progress: 0, fit_message: "fitting in the page…" });
    try {
      const out = await fitter.fit({
        x: x.data, y: y.data, sigma: this.array("sigma")?.data ?? null, mask: this.used, counts: this.model.get("counts"),
        modelId: this.model.get("model_id"), modelOptions: this.model.get("model_options") ?? {}, noise: this.model.get("noise"), params: structuredClone(this.live),
      }, (fraction, message) => this.model.set({ fit_progress: fraction, fit_message: message }), this.localAbort.signal);
      this.model.set({
        result: out.summary, fit_curve: { data: out.curve, shape: [out.curve.length] }, params: out.params,
        fit_state: "done", fit_progress: 1, fit_message: out.summary.message,
      });
    } catch (error) {
      const cancelled = this.localAbort.signal.aborted;
      this.model.set({ fit_state: cancelled ? "cancelled" : "failed", fit_message: cancelled ? "fit cancelled" : (error as Error).message });
    } finally {
      this.localAbort = null;
    }
  }

  override remove(): any {
    this.removed = true;
    this.localAbort?.abort();
    this.rows.clear();
    this.curve = new Float64Array(0);
    this.resid = new Float64Array(0);
    return super.remove();
  }
}
