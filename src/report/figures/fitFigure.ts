/**
 * Data with the fitted model on top and the normalised residuals (y − f)/σ in a panel below,
 * sharing the position axis. Excluded points (mask = 0) are drawn apart, never hidden.
 */
import { InvalidArgumentError } from "../../errors.js";
import type { FitResult } from "../../fit/types.js";
import type { Profile } from "../../profile.js";
import { intensityAxis, lengthAxis } from "./axes.js";
import { plainArray, plotlyText, STATIC_CONFIG, withMimeBundle, type FigureSpec } from "./figureSpec.js";
import { axisStyle, baseLayout, resolveSize, type FigureSize } from "./journal.js";
import { EXCLUDED, GUIDE, INK, seriesStyle } from "./palette.js";

export interface FitFigureOptions extends FigureSize {
  /** Legend name of the model curve (user text, escaped); default "<model id> fit". */
  modelLabel?: string;
  /** Legend name of the data (user text, escaped); default "data". */
  dataLabel?: string;
}

/**
 * Figure of one fit: profile points, model curve, normalised residual panel.
 * Positions are shown with the SI prefix that suits them (usually mm); intensity in the
 * profile's unit. Default size: single column (85 mm) × 70 mm, 8 pt text.
 * @param profile the fitted Profile (x in m)
 * @param result  its FitResult (model and residuals at every x)
 */
export function fitFigure(profile: Profile, result: FitResult, options: FitFigureOptions = {}): FigureSpec {
  checkLengths(profile, result);
  const size = resolveSize(options, 70);
  const axis = lengthAxis(profile.x, "Position", "x");
  const yAxis = intensityAxis(profile.y, profile.yUnit);
  const used: number[] = [];
  const excluded: number[] = [];
  for (let i = 0; i < profile.x.length; i++) (profile.mask && profile.mask[i] === 0 ? excluded : used).push(i);
  const pick = (values: ArrayLike<number>, idx: number[], scale = 1) => plainArray(idx.map((i) => values[i]), scale);
  const markerPx = profile.x.length > 500 ? 2 : 3.5;
  const style = seriesStyle(0);

  const data: Record<string, unknown>[] = [];
  data.push({
    type: "scatter", mode: "markers", name: plotlyText(options.dataLabel ?? "data"),
    x: pick(profile.x, used, axis.scale), y: pick(profile.y, used, yAxis.scale),
    marker: { color: INK, size: markerPx, line: { width: 0 } },
    ...(profile.sigma && used.length <= 200
      ? { error_y: { type: "data", array: pick(profile.sigma, used, yAxis.scale), color: INK, thickness: 0.6, width: 0 } }
      : {}),
    xaxis: "x", yaxis: "y",
  });
  if (excluded.length) {
    data.push({
      type: "scatter", mode: "markers", name: "excluded",
      x: pick(profile.x, excluded, axis.scale), y: pick(profile.y, excluded, yAxis.scale),
      marker: { color: EXCLUDED, size: markerPx + 1.5, symbol: "x-thin-open", line: { width: 0.8, color: EXCLUDED } },
      xaxis: "x", yaxis: "y",
    });
  }
  data.push({
    type: "scatter", mode: "lines", name: plotlyText(options.modelLabel ?? `${result.modelId} fit`),
    x: plainArray(profile.x, axis.scale), y: plainArray(result.model, yAxis.scale),
    line: { color: style.color, width: 1.2, dash: style.dash, shape: "linear" },
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
    xaxis: axisStyle("", { domain: [0, 1], anchor: "y", matches: "x2", showticklabels: false, title: undefined }),
    yaxis: axisStyle(yAxis.title, { domain: [0.3, 1], anchor: "x", rangemode: "tozero" }),
    xaxis2: axisStyle(axis.title, { domain: [0, 1], anchor: "y2" }),
    yaxis2: axisStyle("(<i>I</i>−<i>f</i>)/<i>σ</i>", { domain: [0, 0.22], anchor: "x2", range: [-limit, limit], nticks: 4 }),
    shapes: [{ type: "line", xref: "x2 domain", x0: 0, x1: 1, yref: "y2", y0: 0, y1: 0, line: { color: GUIDE, width: 0.75 } }],
  };
  return withMimeBundle({ data, layout, config: { ...STATIC_CONFIG } });
}

/** Half-range of a residual axis: the largest |r| with 10 % room, at least 3 (so noise looks like noise). */
export function symmetricLimit(values: (number | null)[]): number {
  let largest = 0;
  for (const v of values) if (v !== null) largest = Math.max(largest, Math.abs(v));
  return Math.max(3, Math.ceil(largest * 1.1));
}

function checkLengths(profile: Profile, result: FitResult): void {
  const n = profile.x.length;
  if (profile.y.length !== n || result.model.length !== n || result.residuals.length !== n) {
    throw new InvalidArgumentError(
      "result",
      `model length ${result.model.length}, residuals ${result.residuals.length}`,
      `the FitResult of this profile (${n} points); was it fitted to another profile?`,
    );
  }
}
