/**
 * Export of fringekit figure descriptions to SVG and PDF (vector) and PNG at a chosen
 * resolution, without a browser: the pure renderer in src/report/render draws the SVG (the
 * same code the widgets' export buttons run), resvg rasterises it, pdfScene.ts writes the PDF
 * with the font embedded as a subset. Files are written atomically.
 *
 * Example (kernel or Node):
 *   await exportFigure(fitFigure(profile, result), "fig1.pdf");
 *   await exportFigure(fitFigure(profile, result), "fig1.png", { dpi: 600 });
 */
import path from "node:path";
import { InvalidArgumentError } from "../../src/errors.js";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { figureScene } from "../../src/report/render/figureScene.js";
import type { Scene } from "../../src/report/render/scene.js";
import { sceneToSvg } from "../../src/report/render/svg.js";
import { writeFileAtomic } from "./atomicWrite.js";
import { sceneToPdf } from "./pdfScene.js";
import { sceneToPng } from "./rasterize.js";

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
 * Renders figures to file bytes. Kept as an object so a batch of exports can share one (it
 * holds nothing that needs closing now that no browser is involved; close() stays for callers).
 */
export class FigureRenderer {
  private cache = new WeakMap<FigureSpec, { scene: Scene; svg: string }>();

  /** A renderer (no process is started). */
  static async start(): Promise<FigureRenderer> {
    return new FigureRenderer();
  }

  /** Render `figure` to the bytes of an SVG, PDF or PNG file. */
  async render(figure: FigureSpec, format: FigureFormat, options: RenderOptions = {}): Promise<Uint8Array> {
    checkFigure(figure);
    const dpi = checkDpi(options.dpi ?? 300);
    if (format !== "svg" && format !== "pdf" && format !== "png") throw new InvalidArgumentError("format", format, '"svg", "pdf" or "png"');
    const { scene, svg } = this.drawn(figure);
    if (format === "svg") return new TextEncoder().encode(svg);
    if (format === "png") return sceneToPng(scene, dpi);
    return sceneToPdf(scene);
  }

  /** Nothing to release; kept so code written for a browser-based renderer still runs. */
  async close(): Promise<void> {}

  /** The scene and SVG of a figure, drawn once per figure object when several formats are written. */
  private drawn(figure: FigureSpec): { scene: Scene; svg: string } {
    let hit = this.cache.get(figure);
    if (!hit) {
      const scene = figureScene(figure);
      hit = { scene, svg: sceneToSvg(scene) };
      this.cache.set(figure, hit);
    }
    return hit;
  }
}

/**
 * Render `figure` and return the file bytes (SVG, PDF or PNG).
 * @param figure a figure description from src/report/figures
 */
export async function renderFigure(figure: FigureSpec, format: FigureFormat, options: RenderOptions = {}): Promise<Uint8Array> {
  return new FigureRenderer().render(figure, format, options);
}

/**
 * Render `figure` and write it to `outPath` atomically; the format comes from the extension
 * unless given. Physical size is the figure's (e.g. 85 mm wide); PNG pixels = mm / 25.4 × dpi.
 * This is the entry point behind `fringekit fit ... --figure out.svg`.
 */
export async function exportFigure(figure: FigureSpec, outPath: string, options: ExportOptions = {}, renderer?: FigureRenderer): Promise<ExportedFigure> {
  const format = options.format ?? formatFromPath(outPath);
  const bytes = await (renderer ?? new FigureRenderer()).render(figure, format, options);
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
