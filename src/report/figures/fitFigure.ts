/**
 * Data with the fitted model on top and the normalised residuals (y − f)/σ in a panel below,
 * sharing the position axis. Excluded points (mask = 0) are drawn apart, never hidden.
 */
import { InvalidArgumentError } from "../../errors.js";
import { residualAxisTitle, residualScale, type ResidualScale } from "../../fit/residualScale.js";
import type { FitResult } from "../../fit/types.js";
import type { Profile } from "../../profile.js";
import { symmetricTicks } from "./axes.js";
import { plainArray, plotlyText, STATIC_CONFIG, withMimeBundle, type FigureSpec } from "./figureSpec.js";
import { axisStyle, baseLayout, resolveSize, type FigureSize } from "./journal.js";
import { GUIDE, INK, seriesStyle } from "./palette.js";
import { profileTraces } from "./profileTraces.js";

/**
 * The parts of a FitResult the fit and comparison figures draw: a full FitResult qualifies,
 * and so does a model curve that was not fitted (e.g. a widget's slider model).
 */
export type FitCurves = Pick<FitResult, "modelId" | "model" | "residuals"> & Partial<Pick<FitResult, "noise">>;

/** Options of fitFigure (size in mm, font in pt, legend names). */
export interface FitFigureOptions extends FigureSize {
  /** Legend name of the model curve (user text, escaped); default "<model id> fit". */
  modelLabel?: string;
  /** Legend name of the data (user text, escaped); default "data". */
  dataLabel?: string;
  /** What the residuals are divided by (default: as the fitter does for result.noise and the profile). */
  residualScale?: ResidualScale;
}

/**
 * Figure of one fit: profile points, model curve, normalised residual panel.
 * Positions are shown with the SI prefix that suits them (usually mm); intensity in the
 * profile's unit. Default size: single column (85 mm) × 70 mm, 8 pt text.
 * @param profile the fitted Profile (x in m)
 * @param result  its FitResult, or any FitCurves (model and normalised residuals at every x)
 */
export function fitFigure(profile: Profile, result: FitCurves, options: FitFigureOptions = {}): FigureSpec {
  checkLengths(profile, result);
  const size = resolveSize(options, 70);
  const points = profileTraces(profile, options.dataLabel ?? "data");
  const axis = points.xAxis;
  const yAxis = points.yAxis;
  const markerPx = points.markerPx;
  const style = seriesStyle(0);
  const data: Record<string, unknown>[] = [...points.traces];
  data.push({
    type: "scatter", mode: "lines", name: plotlyText(options.modelLabel ?? `${result.modelId} fit`),
    x: plainArray(profile.x, axis.scale), y: plainArray(result.model, yAxis.scale),
    // Every model point drawn (no plotly path simplification): the vector file holds the curve itself.
    line: { color: style.color, width: 1.2, dash: style.dash, shape: "linear", simplify: false },
    xaxis: "x", yaxis: "y",
  });
  const residuals = plainArray(result.residuals); // NaN where masked: not drawn
  data.push({
    type: "scatter", mode: "markers", name: "residuals", showlegend: false,
    x: plainArray(profile.x, axis.scale), y: residuals,
    marker: { color: INK, size: markerPx, line: { width: 0 } },
    xaxis: "x2", yaxis: "y2",
  });

  const limit = symmetricLimit(residuals);
  const layout = {
    ...baseLayout(size, { kind: "fit", modelId: result.modelId, xUnit: axis.unit }),
    ...residualPanelAxes(axis.title, yAxis.title, limit, { dataFrom: 0.3, residualsTo: 0.22, residualTicks: 4 },
      residualAxisTitle(options.residualScale ?? residualScale(result.noise ?? "auto", profile.sigma !== undefined, profile.counts))),
  };
  return withMimeBundle({ data, layout, config: { ...STATIC_CONFIG } });
}

/** Where the two panels of a data-over-residuals figure sit (fractions of the plot height). */
export interface ResidualPanelSplit {
  /** Bottom of the data panel. */
  dataFrom: number;
  /** Top of the residual panel. */
  residualsTo: number;
  /** Ticks wanted on the residual axis (at most; always at least three, symmetric about 0). */
  residualTicks: number;
}

/**
 * Axes and zero line of a figure with data on top and normalised residuals (in σ, ±limit)
 * below, sharing the position axis (titles are plotly text, already escaped).
 */
export function residualPanelAxes(xTitle: string, yTitle: string, limit: number, split: ResidualPanelSplit, residualTitle = residualAxisTitle("sigma")): Record<string, unknown> {
  return {
    xaxis: axisStyle("", { domain: [0, 1], anchor: "y", matches: "x2", showticklabels: false, title: undefined }),
    yaxis: axisStyle(yTitle, { domain: [split.dataFrom, 1], anchor: "x", rangemode: "tozero" }),
    xaxis2: axisStyle(xTitle, { domain: [0, 1], anchor: "y2" }),
    yaxis2: axisStyle(residualTitle, { domain: [0, split.residualsTo], anchor: "x2", range: [-limit, limit], tickmode: "array", tickvals: symmetricTicks(limit, split.residualTicks) }),
    shapes: [{ type: "line", xref: "x2 domain", x0: 0, x1: 1, yref: "y2", y0: 0, y1: 0, line: { color: GUIDE, width: 0.75 } }],
  };
}

/** Half-range of a residual axis (normalised residuals, in σ): the largest |r| with 10 % room, at least 3 (so noise looks like noise). */
export function symmetricLimit(values: (number | null)[]): number {
  let largest = 0;
  for (const v of values) if (v !== null) largest = Math.max(largest, Math.abs(v));
  return Math.max(3, Math.ceil(largest * 1.1));
}

function checkLengths(profile: Profile, result: FitCurves): void {
  const n = profile.x.length;
  if (profile.y.length !== n || result.model.length !== n || result.residuals.length !== n) {
    throw new InvalidArgumentError(
      "result",
      `model length ${result.model.length}, residuals ${result.residuals.length}`,
      `the FitResult of this profile (${n} points); was it fitted to another profile?`,
    );
  }
}
