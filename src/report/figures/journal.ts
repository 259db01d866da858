/**
 * Journal figure geometry and typography. Widths: single column ≈ 85 mm, double column
 * ≈ 180 mm (common practice across physics and optics journals); text 8 pt (7–9 pt is the
 * usual requirement); sizes are converted to CSS pixels at 96 px per inch, the unit plotly uses.
 */
import { InvalidArgumentError } from "../../errors.js";
import type { FigureMeta, FigureKind } from "./figureSpec.js";
import { INK } from "./palette.js";

/** Named widths (mm): "single" 85, "double" 180 (common practice). */
export const JOURNAL_WIDTH_MM = { single: 85, double: 180 } as const;

/** CSS pixels per millimetre (96 px per inch, CSS 2.1). */
export const PX_PER_MM = 96 / 25.4;
/** CSS pixels per typographic point (1 pt = 1/72 in). */
export const PX_PER_PT = 96 / 72;

/** Fonts: Arial/Helvetica-metric sans serif, the usual journal figure face; Liberation Sans on Debian. */
export const FONT_FAMILY = "Arial, Helvetica, 'Liberation Sans', 'Nimbus Sans', sans-serif";

/** Requested figure size: width ("single", "double" or mm), height (mm), font (pt). */
export interface FigureSize {
  /** "single", "double" or a width in mm (40–250). */
  width?: "single" | "double" | number;
  /** Height in mm; each figure kind has its own default. */
  heightMm?: number;
  /** Font size in pt, 7–9 (default 8). */
  fontPt?: number;
}

/** Resolved figure size in mm and px, and the font size in px. */
export interface ResolvedSize {
  widthMm: number;
  heightMm: number;
  widthPx: number;
  heightPx: number;
  fontPx: number;
  fontPt: number;
}

/** Validate and resolve a FigureSize (mm, pt) to pixels; `defaultHeightMm` is the kind's default. */
export function resolveSize(size: FigureSize = {}, defaultHeightMm: number, defaultWidth: "single" | "double" = "single"): ResolvedSize {
  const width = size.width ?? defaultWidth;
  const widthMm = typeof width === "number" ? width : JOURNAL_WIDTH_MM[width];
  if (typeof widthMm !== "number" || !Number.isFinite(widthMm) || widthMm < 40 || widthMm > 250) {
    throw new InvalidArgumentError("width", width, '"single" (85 mm), "double" (180 mm) or a width in mm from 40 to 250');
  }
  const heightMm = size.heightMm ?? defaultHeightMm;
  if (!Number.isFinite(heightMm) || heightMm < 30 || heightMm > 300) {
    throw new InvalidArgumentError("heightMm", heightMm, "a height in mm from 30 to 300");
  }
  const fontPt = size.fontPt ?? 8;
  if (!Number.isFinite(fontPt) || fontPt < 7 || fontPt > 9) throw new InvalidArgumentError("fontPt", fontPt, "a font size from 7 to 9 pt");
  return {
    widthMm, heightMm, fontPt,
    widthPx: Math.round(widthMm * PX_PER_MM),
    heightPx: Math.round(heightMm * PX_PER_MM),
    fontPx: fontPt * PX_PER_PT,
  };
}

/** A plain axis: full frame, outside ticks, no grid, no zero line (no chart junk). */
export function axisStyle(title: string, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    title: { text: title, standoff: 4 },
    showline: true, mirror: true, linecolor: INK, linewidth: 0.75,
    ticks: "outside", ticklen: 3, tickwidth: 0.75, tickcolor: INK,
    showgrid: false, zeroline: false, automargin: true,
    ...extra,
  };
}

/** Legend in one row above the plot, no frame, short line samples. */
export function baseLegend(size: ResolvedSize): Record<string, unknown> {
  return {
    orientation: "h", x: 0, xanchor: "left", y: 1.0, yanchor: "bottom",
    bgcolor: "rgba(255,255,255,0)", borderwidth: 0, font: { size: size.fontPx },
    itemwidth: 30, tracegroupgap: 0,
  };
}

/** Base layout: white background, journal font and size, compact margins, no title (the caption says it). */
export function baseLayout(
  size: ResolvedSize,
  meta: { kind: FigureKind } & Record<string, unknown>,
): Record<string, unknown> & { width: number; height: number; meta: FigureMeta } {
  return {
    width: size.widthPx,
    height: size.heightPx,
    font: { family: FONT_FAMILY, size: size.fontPx, color: INK },
    paper_bgcolor: "#ffffff",
    plot_bgcolor: "#ffffff",
    margin: { l: 8, r: 6, t: 6, b: 6, pad: 0 },
    showlegend: true,
    legend: baseLegend(size),
    hovermode: "closest",
    meta: { ...meta, widthMm: size.widthMm, heightMm: size.heightMm, fontPt: size.fontPt },
  };
}
