/**
 * Shared frame of every fringekit widget view: a titled header with export actions and a
 * plotly figure, resized with its container, and everything released again on remove.
 */
import { DOMWidgetView } from "@jupyter-widgets/base";
import Plotly from "plotly.js-dist-min";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { h } from "./dom.js";
import { downloadPaperFigure } from "./paperExport.js";
import { ensureStyles } from "./styles.js";

/** Plotly options every widget figure shares (no plotly logo, no cloud links). */
export const plotConfig = {
  displaylogo: false,
  responsive: false,
  modeBarButtonsToRemove: ["toImage", "lasso2d", "sendDataToCloud"],
  scrollZoom: false,
};

/** Base view: builds `.fk-root` with a header (title, extra controls, export buttons) and a plot area. */
export abstract class FigureView extends DOMWidgetView {
  protected root!: HTMLDivElement;
  protected head!: HTMLDivElement;
  protected plotEl!: HTMLDivElement;
  private resizeObserver: ResizeObserver | null = null;
  private exportError!: HTMLSpanElement;
  private plotted = false;
  private lastWidth = 0;
  /** A draw was asked for before the view was in the page (no width yet): done when it gets one. */
  private drawWhenShown = false;

  /** File name stem for exported images. */
  protected abstract exportName(): string;

  /** Build the frame; subclasses call this first in render(). */
  protected buildFrame(title: string, plotHeight: number): void {
    ensureStyles(this.el.ownerDocument);
    this.el.classList.add("fk-widget");
    this.plotEl = h("div", { class: "fk-plot", style: `min-height:${plotHeight}px` });
    const svgButton = h("button", { type: "button", title: "Save the figure as SVG", "data-action": "export-svg" }, "SVG");
    const pngButton = h("button", { type: "button", title: "Save the figure as PNG", "data-action": "export-png" }, "PNG");
    this.exportError = h("span", { class: "fk-export-error", role: "alert", "data-region": "export-error" });
    svgButton.addEventListener("click", () => void this.exportSafely("svg"));
    pngButton.addEventListener("click", () => void this.exportSafely("png"));
    this.head = h("div", { class: "fk-head" }, h("span", { class: "fk-title" }, title));
    this.root = h("div", { class: "fk-root" }, this.head);
    this.head.append(h("span", { class: "fk-seg", role: "group", "aria-label": "Export figure" }, svgButton, pngButton), this.exportError);
    this.el.append(this.root);
    this.resizeObserver = new ResizeObserver(() => {
      const width = this.plotEl.clientWidth;
      if (width > 0 && this.drawWhenShown) {
        this.drawWhenShown = false;
        this.lastWidth = width;
        this.redrawAll();
        return;
      }
      if (this.plotted && width > 0 && Math.abs(width - this.lastWidth) > 2) {
        this.lastWidth = width;
        this.resized();
      }
    });
    this.resizeObserver.observe(this.root);
  }

  /** The container changed width: fit the figure to it. */
  protected resized(): void {
    void Plotly.Plots.resize(this.plotEl);
  }

  /** Draw everything from the model again (called when a draw put off by drawFigure can run). */
  protected abstract redrawAll(): void;

  /** True when the plot is in the page with a width, so plotly can lay it out at its real size. */
  protected isShown(): boolean {
    return this.plotEl.isConnected && this.plotEl.clientWidth > 0;
  }

  /**
   * Draw or redraw the whole figure. A view is rendered before the widget manager puts it into
   * the page: a figure drawn then would be laid out at a guessed size and drawn again at once
   * when the view appears, so the draw is put off until the view has a width (redrawAll).
   * @returns false when the draw was put off
   */
  protected async drawFigure(data: Record<string, unknown>[], layout: Record<string, unknown>): Promise<boolean> {
    if (!this.isShown()) {
      this.drawWhenShown = true;
      return false;
    }
    this.lastWidth = this.plotEl.clientWidth;
    await Plotly.react(this.plotEl, data, { ...layout, width: undefined, autosize: true }, plotConfig);
    this.plotted = true;
    return true;
  }

  /**
   * The paper figures of the view's current state, built by the src/report/figures builders
   * (the same descriptions the headless exporter renders), at their journal sizes.
   */
  abstract paperFigures(): FigureSpec[];

  /**
   * Save the paper figures of the current state from the browser (SVG sized in mm, or PNG at
   * 300 dpi), one file each; the on-screen figure is left as it is.
   */
  async exportImage(format: "svg" | "png"): Promise<void> {
    await this.saveFigures(this.paperFigures(), format);
  }

  private async saveFigures(figures: FigureSpec[], format: "svg" | "png"): Promise<void> {
    for (const [i, figure] of figures.entries()) {
      await downloadPaperFigure(this.el.ownerDocument, figure, format, figures.length > 1 ? `${this.exportName()}-${i + 1}` : this.exportName());
    }
  }

  /** The export buttons' action: a figure that cannot be built says why beside the buttons. */
  private async exportSafely(format: "svg" | "png"): Promise<void> {
    this.exportError.textContent = "";
    try {
      const figures = this.paperFigures();
      if (figures.length === 0) throw new Error("nothing to export yet: the widget has no data");
      await this.saveFigures(figures, format);
    } catch (error) {
      this.exportError.textContent = `Export failed: ${error instanceof Error ? error.message : String(error)}`;
    }
  }

  /** Plot elements the view draws with plotly (purged on remove). */
  protected exportTargets(): HTMLElement[] {
    return [this.plotEl];
  }

  /** The on-screen figure as an image data URL (for tests and notebook exports). */
  imageUrl(format: "svg" | "png"): Promise<string> {
    return Plotly.toImage(this.plotEl, { format, width: 800, height: 500 });
  }

  override remove(): any {
    this.resizeObserver?.disconnect();
    this.resizeObserver = null;
    for (const target of this.exportTargets()) Plotly.purge(target);
    this.plotted = false;
    return super.remove();
  }
}

/** Plotly layout pieces shared by every widget figure. */
export function baseLayout(extra: Record<string, unknown>): Record<string, unknown> {
  return {
    margin: { l: 64, r: 16, t: 14, b: 46 },
    font: { family: "system-ui, -apple-system, Segoe UI, sans-serif", size: 12, color: "#1e293b" },
    paper_bgcolor: "#ffffff",
    plot_bgcolor: "#ffffff",
    showlegend: true,
    legend: { orientation: "h", x: 0, y: 1.02, yanchor: "bottom", bgcolor: "rgba(255,255,255,0)" },
    hovermode: "closest",
    ...extra,
  };
}

/** An axis with light grid lines and a title. */
export function axis(title: string, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    title: { text: title, standoff: 6 },
    gridcolor: "#eef2f6",
    zerolinecolor: "#cbd5e1",
    linecolor: "#94a3b8",
    ticks: "outside",
    tickcolor: "#94a3b8",
    automargin: true,
    ...extra,
  };
}
