/**
 * Headless export of fringekit figure descriptions to SVG and PDF (vector) and PNG at a chosen
 * resolution, rendered by plotly.js in Debian's Chromium. Files are written atomically.
 *
 * Example (kernel or Node):
 *   await exportFigure(fitFigure(profile, result), "fig1.pdf");
 *   await exportFigure(fitFigure(profile, result), "fig1.png", { dpi: 600 });
 */
import path from "node:path";
import { InvalidArgumentError } from "../../src/errors.js";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { writeFileAtomic } from "./atomicWrite.js";
import { openPlotlyPage, type PlotlyPage } from "./browser.js";
import { setPngDpi } from "./pngDensity.js";

/** Export formats: SVG and PDF (vector) and PNG (raster at a chosen dpi). */
export type FigureFormat = "svg" | "pdf" | "png";

/** Options of rendering one figure. */
export interface RenderOptions {
  /** PNG resolution in dots per inch, 72–1200 (default 300; journals ask 300–600 for line art). */
  dpi?: number;
}

/** Options of exportFigure. */
export interface ExportOptions extends RenderOptions {
  /** Output format; default from the file name's extension (.svg, .pdf, .png). */
  format?: FigureFormat;
}

/** What was written. */
export interface ExportedFigure {
  path: string;
  format: FigureFormat;
  bytes: number;
  widthMm: number;
  heightMm: number;
  /** Pixel size for PNG; undefined for vector formats. */
  widthPx?: number;
  heightPx?: number;
}

/**
 * One Chromium page that renders many figures in turn (starting Chromium costs about a
 * second; reuse a renderer for a batch). Always close() it, also on failure.
 */
export class FigureRenderer {
  private constructor(private readonly browser: PlotlyPage) {}

  /** Start Chromium and load plotly.js. */
  static async start(): Promise<FigureRenderer> {
    return new FigureRenderer(await openPlotlyPage());
  }

  /** Render `figure` to the bytes of an SVG, PDF or PNG file. */
  async render(figure: FigureSpec, format: FigureFormat, options: RenderOptions = {}): Promise<Uint8Array> {
    checkFigure(figure);
    const dpi = checkDpi(options.dpi ?? 300);
    const svg = await this.svg(figure);
    if (format === "svg") return new TextEncoder().encode(svg);
    if (format === "png") return setPngDpi(await this.png(figure, dpi), dpi);
    if (format === "pdf") return this.pdf(svg, figure);
    throw new InvalidArgumentError("format", format, '"svg", "pdf" or "png"');
  }

  /** Draw `figure` and list the traces plotly actually rendered (type and name), for checks. */
  async renderedTraces(figure: FigureSpec): Promise<{ type: string; name: string }[]> {
    checkFigure(figure);
    await this.plot(figure, "svg", 1);
    return this.browser.page.evaluate(() => {
      const gd = (globalThis as any).document.getElementById("figure");
      return (gd._fullData as { type: string; name: string }[]).map((t) => ({ type: t.type, name: t.name }));
    });
  }

  /** Stop Chromium and remove its temporary profile. */
  async close(): Promise<void> {
    await this.browser.close();
  }

  private async plot(figure: FigureSpec, format: "svg" | "png", scale: number): Promise<string> {
    const { data, layout, config } = JSON.parse(JSON.stringify({ data: figure.data, layout: figure.layout, config: figure.config }));
    return this.browser.page.evaluate(
      async ({ data, layout, config, format, scale }) => {
        const Plotly = (globalThis as unknown as { Plotly: any }).Plotly;
        const gd = (globalThis as any).document.getElementById("figure");
        Plotly.purge(gd);
        await Plotly.newPlot(gd, data, layout, config);
        return Plotly.toImage(gd, { format, width: layout.width, height: layout.height, scale }) as Promise<string>;
      },
      { data, layout, config, format, scale },
    );
  }

  private async svg(figure: FigureSpec): Promise<string> {
    const url = await this.plot(figure, "svg", 1);
    const text = decodeURIComponent(url.slice(url.indexOf(",") + 1));
    return physicalSvgSize(text, figure);
  }

  private async png(figure: FigureSpec, dpi: number): Promise<Uint8Array> {
    const url = await this.plot(figure, "png", dpi / 96);
    return new Uint8Array(Buffer.from(url.slice(url.indexOf(",") + 1), "base64"));
  }

  private async pdf(svg: string, figure: FigureSpec): Promise<Uint8Array> {
    const { widthMm, heightMm } = figure.layout.meta;
    const page = await this.browser.context.newPage();
    try {
      await page.setContent(
        `<!doctype html><html><head><meta charset="utf-8"><style>@page{size:${widthMm}mm ${heightMm}mm;margin:0}` +
          `html,body{margin:0;padding:0}svg{display:block}</style></head><body>${svg.replace(/^<\?xml[^>]*>/, "")}</body></html>`,
      );
      const bytes = await page.pdf({ width: `${widthMm}mm`, height: `${heightMm}mm`, printBackground: true, pageRanges: "1", margin: { top: "0", right: "0", bottom: "0", left: "0" } });
      return new Uint8Array(bytes);
    } finally {
      await page.close();
    }
  }
}

/**
 * Render `figure` with a fresh Chromium and return the file bytes (SVG, PDF or PNG).
 * @param figure a figure description from src/report/figures
 */
export async function renderFigure(figure: FigureSpec, format: FigureFormat, options: RenderOptions = {}): Promise<Uint8Array> {
  const renderer = await FigureRenderer.start();
  try {
    return await renderer.render(figure, format, options);
  } finally {
    await renderer.close();
  }
}

/**
 * Render `figure` and write it to `outPath` atomically; the format comes from the extension
 * unless given. Physical size is the figure's (e.g. 85 mm wide); PNG pixels = mm / 25.4 × dpi.
 * This is the entry point behind `fringekit fit ... --figure out.svg`.
 */
export async function exportFigure(figure: FigureSpec, outPath: string, options: ExportOptions = {}, renderer?: FigureRenderer): Promise<ExportedFigure> {
  const format = options.format ?? formatFromPath(outPath);
  const bytes = renderer ? await renderer.render(figure, format, options) : await renderFigure(figure, format, options);
  await writeFileAtomic(outPath, bytes);
  const { widthMm, heightMm } = figure.layout.meta;
  const result: ExportedFigure = { path: outPath, format, bytes: bytes.length, widthMm, heightMm };
  if (format === "png") {
    const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    result.widthPx = view.getUint32(16);
    result.heightPx = view.getUint32(20);
  }
  return result;
}

/** The export format implied by a file name: .svg, .pdf or .png (case-insensitive). */
export function formatFromPath(file: string): FigureFormat {
  const ext = path.extname(file).toLowerCase().slice(1);
  if (ext === "svg" || ext === "pdf" || ext === "png") return ext;
  throw new InvalidArgumentError("figure file", file, "a name ending in .svg, .pdf or .png");
}

/** Give the SVG its physical size in mm (viewBox in CSS px), so it prints at journal size. */
function physicalSvgSize(svg: string, figure: FigureSpec): string {
  const { width, height, meta } = figure.layout;
  return svg.replace(/<svg\b([^>]*)>/, (_match, attrs: string) => {
    const kept = attrs.replace(/\s(width|height|viewBox)="[^"]*"/g, "");
    return `<svg${kept} width="${meta.widthMm}mm" height="${meta.heightMm}mm" viewBox="0 0 ${width} ${height}">`;
  });
}

function checkFigure(figure: FigureSpec): void {
  const meta = figure?.layout?.meta;
  if (!figure || !Array.isArray(figure.data) || !meta || !Number.isFinite(meta.widthMm) || !Number.isFinite(meta.heightMm)) {
    throw new InvalidArgumentError("figure", typeof figure, "a figure description from fringekit's figure builders ({data, layout with meta, config})");
  }
}

function checkDpi(dpi: number): number {
  if (!Number.isFinite(dpi) || dpi < 72 || dpi > 1200) throw new InvalidArgumentError("dpi", dpi, "a resolution from 72 to 1200 dots per inch");
  return dpi;
}
