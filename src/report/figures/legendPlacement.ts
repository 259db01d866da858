/** Legend placement where no data are: a free corner of the plot area, else above it. */
import { baseLegend, type ResolvedSize } from "./journal.js";

/** Axis range [low, high] in the units the traces are drawn in. */
export type AxisRange = readonly [number, number];

/** Corners tried in turn, as plotly legend anchors (x, y in plot-area fractions). */
const CORNERS = [
  { x: 1, y: 1, xanchor: "right", yanchor: "top" },
  { x: 0, y: 1, xanchor: "left", yanchor: "top" },
  { x: 1, y: 0, xanchor: "right", yanchor: "bottom" },
  { x: 0, y: 0, xanchor: "left", yanchor: "bottom" },
] as const;

/**
 * Legend layout for a single-panel figure: a vertical legend in the first corner of the plot
 * area (top right, top left, bottom right, bottom left) whose estimated box holds no point of
 * any trace (markers, line vertices, error-bar ends, filled bands), else one row above the plot.
 * The box is estimated from the longest legend name (0.6 em per character, a line sample of
 * 30 px) and the font size; the plot area from the figure size minus typical axis margins.
 * @param data   plotly traces (x, y arrays, optional error_y.array, showlegend, name)
 * @param xRange x axis range of the plot area (trace units)
 * @param yRange y axis range of the plot area (trace units)
 * @param size   resolved figure size (px)
 */
export function legendWhereFree(data: readonly Record<string, unknown>[], xRange: AxisRange, yRange: AxisRange, size: ResolvedSize): Record<string, unknown> {
  const names = data.filter((t) => t.showlegend !== false && typeof t.name === "string").map((t) => plainLength(t.name as string));
  const plotWidth = size.widthPx - 4.5 * size.fontPx - 8;
  const plotHeight = size.heightPx - 3.2 * size.fontPx - 8;
  const boxWidth = (38 + 0.6 * size.fontPx * Math.max(0, ...names) + 10) / plotWidth;
  const boxHeight = (names.length * 1.5 * size.fontPx + 8) / plotHeight;
  const points = tracePoints(data, xRange, yRange);
  // Keep markers (about 2 % of the plot) clear of the box edge too.
  const pad = 0.02;
  for (const corner of CORNERS) {
    const x0 = corner.x === 1 ? 1 - boxWidth - pad : 0, x1 = corner.x === 1 ? 1 : boxWidth + pad;
    const y0 = corner.y === 1 ? 1 - boxHeight - pad : 0, y1 = corner.y === 1 ? 1 : boxHeight + pad;
    if (boxWidth + pad > 1 || boxHeight + pad > 1) break;
    if (!points.some(([x, y]) => x >= x0 && x <= x1 && y >= y0 && y <= y1)) {
      return { ...baseLegend(size), orientation: "v", ...corner, bgcolor: "rgba(255,255,255,0)" };
    }
  }
  return baseLegend(size);
}

/** Every drawn point of the traces as plot-area fractions (error-bar ends and lines sampled at their vertices and midpoints). */
function tracePoints(data: readonly Record<string, unknown>[], xRange: AxisRange, yRange: AxisRange): [number, number][] {
  const fx = (x: number) => (x - xRange[0]) / (xRange[1] - xRange[0]);
  const fy = (y: number) => (y - yRange[0]) / (yRange[1] - yRange[0]);
  const out: [number, number][] = [];
  for (const trace of data) {
    const xs = trace.x as (number | null)[] | undefined, ys = trace.y as (number | null)[] | undefined;
    if (!Array.isArray(xs) || !Array.isArray(ys)) continue;
    const errors = (trace.error_y as { array?: (number | null)[] } | undefined)?.array;
    for (let i = 0; i < Math.min(xs.length, ys.length); i++) {
      const x = xs[i], y = ys[i];
      if (typeof x !== "number" || typeof y !== "number") continue;
      out.push([fx(x), fy(y)]);
      const e = errors?.[i];
      if (typeof e === "number") out.push([fx(x), fy(y + e)], [fx(x), fy(y - e)]);
      const nx = xs[i + 1], ny = ys[i + 1];
      if (typeof nx === "number" && typeof ny === "number") out.push([fx((x + nx) / 2), fy((y + ny) / 2)]);
    }
  }
  return out;
}

/** Length in characters of plotly text once its markup and entities are rendered. */
function plainLength(text: string): number {
  return text.replace(/<[^>]*>/g, "").replace(/&[#\w]+;/g, "x").length;
}
