/**
 * Save a paper figure from the browser: the figure description built by src/report/figures
 * (the same one the headless exporter renders) is drawn by plotly.js off screen at its
 * journal size and saved as SVG (physical size in mm) or PNG (at a resolution in dpi).
 */
import Plotly from "plotly.js-dist-min";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { setPngDpi } from "../../kernel-ext/figures/pngDensity.js";

/** PNG resolution of the export buttons (dots per inch; the headless exporter's default too). */
export const EXPORT_DPI = 300;

/**
 * Draw `figure` at its own size (layout.width × layout.height CSS px) in a hidden element and
 * return the file contents: SVG text sized in mm, or PNG bytes at `dpi` with the dpi recorded.
 */
export async function renderPaperFigure(doc: Document, figure: FigureSpec, format: "svg" | "png", dpi = EXPORT_DPI): Promise<string | Uint8Array> {
  const { width, height } = figure.layout;
  // Off screen but laid out: plotly measures text, which needs a rendered element.
  const host = doc.createElement("div");
  host.setAttribute("aria-hidden", "true");
  host.style.cssText = `position:fixed;left:-20000px;top:0;width:${width}px;height:${height}px;pointer-events:none`;
  doc.body.append(host);
  try {
    // A deep copy: plotly writes into the objects it is given.
    const { data, layout, config } = JSON.parse(JSON.stringify({ data: figure.data, layout: figure.layout, config: figure.config }));
    await Plotly.newPlot(host, data, layout, config);
    const url = await Plotly.toImage(host, { format, width, height, scale: format === "png" ? dpi / 96 : 1 });
    const body = url.slice(url.indexOf(",") + 1);
    if (format === "svg") return physicalSvgSize(decodeURIComponent(body), figure);
    const raw = atob(body);
    const bytes = new Uint8Array(raw.length);
    for (let i = 0; i < raw.length; i++) bytes[i] = raw.charCodeAt(i);
    return setPngDpi(bytes, dpi);
  } finally {
    Plotly.purge(host);
    host.remove();
  }
}

/** Give the SVG its physical size in mm (viewBox in CSS px), so it prints at journal size. */
export function physicalSvgSize(svg: string, figure: FigureSpec): string {
  const { width, height, meta } = figure.layout;
  return svg.replace(/<svg\b([^>]*)>/, (_match, attrs: string) => {
    const kept = attrs.replace(/\s(width|height|viewBox)="[^"]*"/g, "");
    return `<svg${kept} width="${meta.widthMm}mm" height="${meta.heightMm}mm" viewBox="0 0 ${width} ${height}">`;
  });
}

/** Render `figure` and hand it to the browser as a download named `stem`.svg / .png. */
export async function downloadPaperFigure(doc: Document, figure: FigureSpec, format: "svg" | "png", stem: string): Promise<void> {
  const content = await renderPaperFigure(doc, figure, format);
  const blob = new Blob([content as BlobPart], { type: format === "svg" ? "image/svg+xml" : "image/png" });
  const url = URL.createObjectURL(blob);
  const link = doc.createElement("a");
  link.href = url;
  link.download = `${stem}.${format}`;
  link.style.display = "none";
  doc.body.append(link);
  try {
    link.click();
  } finally {
    link.remove();
    // The download has taken the blob by the next task; free it then.
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  }
}

/** Split `items` into groups of at most `size` (builders draw at most four curves or fits). */
export function groupsOf<T>(items: readonly T[], size: number): T[][] {
  const groups: T[][] = [];
  for (let i = 0; i < items.length; i += size) groups.push(items.slice(i, i + size));
  return groups;
}
