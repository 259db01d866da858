/**
 * Save a paper figure from the browser: the figure description built by src/report/figures
 * is drawn by the same pure renderer the kernel and the command line use (src/report/render),
 * so the SVG saved here is byte for byte the headless exporter's; PNG is that SVG drawn on a
 * canvas at a resolution in dpi (fonts: the page's Liberation Sans or Arial).
 */
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { figureSvg } from "../../src/report/render/figureSvg.js";
import { setPngDpi } from "../../src/report/render/pngDensity.js";

/** PNG resolution of the export buttons (dots per inch; the headless exporter's default too). */
export const EXPORT_DPI = 300;

/**
 * The file contents of `figure`: SVG text sized in mm, or PNG bytes at `dpi` with the dpi recorded.
 */
export async function renderPaperFigure(doc: Document, figure: FigureSpec, format: "svg" | "png", dpi = EXPORT_DPI): Promise<string | Uint8Array> {
  const svg = figureSvg(figure);
  if (format === "svg") return svg;
  return setPngDpi(await svgToPngInPage(doc, svg, figure.layout.meta.widthMm, figure.layout.meta.heightMm, dpi), dpi);
}

/** Draw `svg` on a canvas of widthMm × heightMm at `dpi` (white background) and return the PNG bytes. */
async function svgToPngInPage(doc: Document, svg: string, widthMm: number, heightMm: number, dpi: number): Promise<Uint8Array> {
  const width = Math.round((widthMm / 25.4) * dpi), height = Math.round((heightMm / 25.4) * dpi);
  const url = URL.createObjectURL(new Blob([svg], { type: "image/svg+xml" }));
  try {
    const image = new Image();
    image.width = width;
    image.height = height;
    await new Promise<void>((resolve, reject) => {
      image.onload = () => resolve();
      image.onerror = () => reject(new Error("the browser could not draw the figure's SVG"));
      image.src = url;
    });
    const canvas = doc.createElement("canvas");
    canvas.width = width;
    canvas.height = height;
    const context = canvas.getContext("2d");
    if (!context) throw new Error("no 2D canvas in this browser");
    context.fillStyle = "#ffffff";
    context.fillRect(0, 0, width, height);
    context.drawImage(image, 0, 0, width, height);
    const blob = await new Promise<Blob>((resolve, reject) => canvas.toBlob((b) => (b ? resolve(b) : reject(new Error("canvas gave no PNG"))), "image/png"));
    return new Uint8Array(await blob.arrayBuffer());
  } finally {
    URL.revokeObjectURL(url);
  }
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
