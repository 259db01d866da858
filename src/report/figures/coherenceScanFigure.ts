/**
 * Coherence scan: fringe visibility against slit separation, the fitted coherence curve
 * (e.g. |2J₁(v)/v| for a uniform disc source, van Cittert–Zernike) and its confidence band.
 */
import { InvalidArgumentError } from "../../errors.js";
import type { FitResult } from "../../fit/types.js";
import type { Model } from "../../physics/model.js";
import type { Profile } from "../../profile.js";
import { lengthAxis } from "./axes.js";
import { confidenceBand, type Band } from "./confidenceBand.js";
import { plainArray, plotlyText, STATIC_CONFIG, withMimeBundle, type FigureSpec } from "./figureSpec.js";
import { axisStyle, baseLayout, resolveSize, type FigureSize } from "./journal.js";
import { legendWhereFree } from "./legendPlacement.js";
import { BAND_FILL, INK, seriesStyle } from "./palette.js";

/** Options of coherenceScanFigure (size in mm, font in pt, band level). */
export interface CoherenceScanFigureOptions extends FigureSize {
  /** Confidence level of the band (default 0.95). */
  level?: number;
  /** Points of the drawn curve (default 300). */
  curvePoints?: number;
  modelLabel?: string;
}

/**
 * Figure of a coherence scan: measured visibilities (with σ as error bars when known),
 * fitted curve from zero to beyond the largest separation, and its delta-method band.
 * Default size: single column (85 mm) × 60 mm.
 * @param scan   Profile with x = slit separation (m), y = visibility (1)
 * @param result the fit of `model` to the scan
 * @param model  the coherence model (coherence-disc, coherence-gaussian, ...)
 */
export function coherenceScanFigure(scan: Profile, result: FitResult, model: Model, options: CoherenceScanFigureOptions = {}): FigureSpec {
  if (scan.x.length === 0) throw new InvalidArgumentError("scan", "no points", "a coherence scan with at least one separation");
  const grid = coherenceScanGrid(scan.x, options.curvePoints ?? 300);
  const band = confidenceBand(model, result, grid, options.level ?? 0.95);
  return coherenceBandFigure(scan, grid, band, result.modelId, options);
}

/**
 * The separations (m) the fitted curve of a coherence scan is drawn at: `count` points from
 * zero to 8 % beyond the largest measured separation.
 */
export function coherenceScanGrid(separations: ArrayLike<number>, count = 300): Float64Array {
  if (!Number.isInteger(count) || count < 10 || count > 100_000) throw new InvalidArgumentError("curvePoints", count, "an integer from 10 to 100000");
  let largest = 0;
  for (let i = 0; i < separations.length; i++) largest = Math.max(largest, separations[i]);
  const grid = new Float64Array(count);
  for (let i = 0; i < count; i++) grid[i] = (1.08 * largest * i) / (count - 1);
  return grid;
}

/**
 * The coherence-scan figure from a band already computed at `grid` (m), e.g. the one a widget
 * holds: what coherenceScanFigure draws once it has the band.
 * @param scan    Profile with x = slit separation (m), y = visibility (1)
 * @param grid    separations (m) of the band
 * @param band    fitted curve and confidence band at `grid` (visibility, 1)
 * @param modelId id of the fitted coherence model (for the default legend name and layout.meta)
 */
export function coherenceBandFigure(scan: Profile, grid: Float64Array, band: Band, modelId: string, options: CoherenceScanFigureOptions = {}): FigureSpec {
  if (scan.x.length === 0) throw new InvalidArgumentError("scan", "no points", "a coherence scan with at least one separation");
  if (band.center.length !== grid.length || band.lower.length !== grid.length || band.upper.length !== grid.length) {
    throw new InvalidArgumentError("band", `${band.center.length} points`, `a band at each of the ${grid.length} grid separations`);
  }
  const size = resolveSize(options, 60);
  const axis = lengthAxis(grid, "Slit separation", "d");
  const xs = plainArray(grid, axis.scale);
  const style = seriesStyle(0);
  const percent = `${Math.round(band.level * 1000) / 10} %`;

  const data: Record<string, unknown>[] = [
    {
      type: "scatter", mode: "lines", x: xs, y: plainArray(band.lower), line: { width: 0 },
      hoverinfo: "skip", showlegend: false, name: "band lower",
    },
    {
      type: "scatter", mode: "lines", x: xs, y: plainArray(band.upper), line: { width: 0 },
      fill: "tonexty", fillcolor: BAND_FILL, name: `${percent} confidence band`,
    },
    {
      type: "scatter", mode: "lines", x: xs, y: plainArray(band.center),
      line: { color: style.color, width: 1.2, dash: style.dash }, name: plotlyText(options.modelLabel ?? `${modelId} fit`),
    },
    {
      type: "scatter", mode: "markers", name: "measured", x: plainArray(scan.x, axis.scale), y: plainArray(scan.y),
      marker: { color: INK, size: 4.5, symbol: "circle" },
      ...(scan.sigma ? { error_y: { type: "data", array: plainArray(scan.sigma), color: INK, thickness: 0.75, width: 2 } } : {}),
    },
  ];
  const xRange = [0, (xs[xs.length - 1] as number) ?? 1] as const;
  const yRange = visibilityRange(data);
  const layout = {
    ...baseLayout(size, { kind: "coherence-scan", modelId, level: band.level, xUnit: axis.unit }),
    xaxis: axisStyle(axis.title, { range: xRange }),
    yaxis: axisStyle("Visibility <i>V</i>", { range: yRange }),
    // A corner the curve, band and error bars leave free, else a row above the plot.
    legend: legendWhereFree(data, xRange, yRange, size),
  };
  return withMimeBundle({ data, layout, config: { ...STATIC_CONFIG } });
}

/** y range of a coherence scan: from 0 (or the lowest point) to 6 % above the highest point, band or error bar. */
function visibilityRange(data: readonly Record<string, unknown>[]): readonly [number, number] {
  let low = 0, high = 0;
  for (const trace of data) {
    const ys = trace.y as (number | null)[];
    const errors = (trace.error_y as { array?: (number | null)[] } | undefined)?.array;
    ys.forEach((y, i) => {
      if (y === null) return;
      const e = errors?.[i] ?? 0;
      low = Math.min(low, y - e);
      high = Math.max(high, y + e);
    });
  }
  if (!(high > low)) high = low + 1;
  const room = 0.06 * (high - low);
  return [low < 0 ? low - room : 0, high + room];
}
