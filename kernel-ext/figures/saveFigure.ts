/**
 * One call that writes a paper figure in several formats: `out/first-fit.svg`, `.pdf`, `.png`.
 * The folder is created when missing; each file is written atomically. No browser is needed:
 * the figure is drawn once (src/report/render) and written as SVG, PDF (pdfScene.ts) and PNG (resvg).
 */
import { mkdir } from "node:fs/promises";
import path from "node:path";
import { InvalidArgumentError } from "../../src/errors.js";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { FigureRenderer, exportFigure, type ExportedFigure, type FigureFormat } from "./exportFigure.js";
import { loadRasterizer } from "./rasterize.js";

/** Options of saveFigure. */
export interface SaveFigureOptions {
  /** Formats to write (default ["svg", "pdf", "png"]). */
  formats?: FigureFormat[];
  /** PNG resolution in dots per inch, 72–1200 (default 600). */
  dpi?: number;
}

/**
 * Write `figure` (a description from the figure builders, e.g. `fitFigure(...)`) to
 * `basePath` + ".svg" / ".pdf" / ".png". A `basePath` that already ends in one of these
 * extensions has it removed first. Physical size is the figure's own (mm); PNG pixels are
 * mm / 25.4 × dpi.
 * @returns what was written, one entry per format, in the order asked
 * @example await saveFigure(fitFigure(profile, result), "out/figures/first-fit", { formats: ["svg", "png"], dpi: 600 })
 */
export async function saveFigure(figure: FigureSpec, basePath: string, options: SaveFigureOptions = {}): Promise<ExportedFigure[]> {
  if (typeof basePath !== "string" || basePath.trim() === "") throw new InvalidArgumentError("basePath", basePath, 'a file path without extension, e.g. "out/figures/first-fit"');
  const formats = options.formats ?? ["svg", "pdf", "png"];
  if (!Array.isArray(formats) || formats.length === 0 || formats.some((f) => f !== "svg" && f !== "pdf" && f !== "png")) {
    throw new InvalidArgumentError("formats", formats, 'a non-empty list of "svg", "pdf", "png"');
  }
  const base = basePath.replace(/\.(svg|pdf|png)$/i, "");
  await mkdir(path.dirname(path.resolve(base)), { recursive: true });
  const renderer = await FigureRenderer.start();
  // A rasteriser that fails to load fails the PNG alone (in sceneToPng), as before.
  if (formats.includes("png")) await loadRasterizer().catch(() => undefined);
  try {
    // All formats at once, the PNG first: resvg draws it on a worker thread while the PDF is
    // written here (the PDF writer does not yield, so started first it would delay the PNG).
    const started = new Map<FigureFormat, Promise<ExportedFigure>>();
    for (const format of [...formats].sort((a, b) => Number(b === "png") - Number(a === "png"))) {
      if (!started.has(format)) started.set(format, exportFigure(figure, `${base}.${format}`, { format, dpi: options.dpi ?? 600 }, renderer));
    }
    return await Promise.all(formats.map((format) => started.get(format)!));
  } finally {
    await renderer.close();
  }
}
