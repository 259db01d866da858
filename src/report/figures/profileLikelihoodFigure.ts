/**
 * Profile-likelihood panels: for each parameter, the rise of the objective (Δχ², or twice
 * the log-likelihood drop) against the parameter, with the χ²₁ thresholds 1 (68.27 %)
 * and 3.84 (95 %) that define the intervals (Wilks 1938).
 */
import { InvalidArgumentError } from "../../errors.js";
import type { ProfileCurve } from "../../fit/profileCurve.js";
import { chiSquaredQuantile } from "../../math/chiSquared.js";
import { formatQuantity } from "../formatQuantity.js";
import { parameterLabel } from "../labels.js";
import { choosePrefix, takesPrefix } from "../siPrefix.js";
import { plainArray, STATIC_CONFIG, withMimeBundle, type FigureSpec } from "./figureSpec.js";
import { axisStyle, baseLayout, resolveSize, type FigureSize } from "./journal.js";
import { GUIDE, INK, seriesStyle } from "./palette.js";


/**
 * Panels side by side, one per curve (1–4). Default size: double column (180 mm) × 55 mm.
 */
export function profileLikelihoodFigure(curves: readonly ProfileCurve[], options: FigureSize = {}): FigureSpec {
  if (!Array.isArray(curves) || curves.length < 1 || curves.length > 4) {
    throw new InvalidArgumentError("curves", Array.isArray(curves) ? `${curves.length} curves` : curves, "1 to 4 profile curves");
  }
  const size = resolveSize(options, 55, "double");
  const thresholds = [chiSquaredQuantile(0.6827, 1), chiSquaredQuantile(0.95, 1)];
  const gap = 0.08;
  const right = 0.95; // room for the threshold labels
  const width = (right - gap * (curves.length - 1)) / curves.length;
  const data: Record<string, unknown>[] = [];
  const layoutAxes: Record<string, unknown> = {};
  const shapes: Record<string, unknown>[] = [];
  const annotations: Record<string, unknown>[] = [];
  let top = thresholds[1] * 1.5;
  curves.forEach((curve, i) => {
    if (curve.values.length !== curve.deltaObjective.length || curve.values.length < 3) {
      throw new InvalidArgumentError(`curves[${i}]`, curve.name, "values and deltaObjective of the same length, at least 3 points");
    }
    const prefix = takesPrefix(curve.unit) ? choosePrefix(curve.best ?? curve.values[0]) : { symbol: "", exponent: 0 };
    const scale = 10 ** -prefix.exponent;
    const unit = curve.unit === "1" ? "" : `${prefix.symbol}${curve.unit}`;
    const suffix = i === 0 ? "" : String(i + 1);
    const style = seriesStyle(0);
    data.push({
      type: "scatter", mode: "lines+markers", name: "profile", showlegend: i === 0,
      x: plainArray(curve.values, scale), y: plainArray(curve.deltaObjective),
      line: { color: style.color, width: 1.2 }, marker: { color: style.color, size: 3 },
      xaxis: `x${suffix}`, yaxis: `y${suffix}`,
    });
    if (curve.best !== undefined && curve.uncertainty !== undefined && Number.isFinite(curve.uncertainty) && curve.uncertainty > 0) {
      const xs: number[] = Array.from(curve.values as ArrayLike<number>);
      data.push({
        type: "scatter", mode: "lines", name: "quadratic (covariance)", showlegend: i === 0,
        x: xs.map((v) => v * scale), y: xs.map((v) => ((v - curve.best!) / curve.uncertainty!) ** 2),
        line: { color: INK, width: 0.8, dash: "dot" }, xaxis: `x${suffix}`, yaxis: `y${suffix}`,
      });
    }
    thresholds.forEach((t, n) => {
      if (i === curves.length - 1) {
        annotations.push({
          xref: `x${suffix} domain`, x: 1, xanchor: "left", yref: `y${suffix}`, y: t, yanchor: "middle",
          text: n === 0 ? "68 %" : "95 %", showarrow: false, font: { color: GUIDE, size: size.fontPx * 0.875 },
        });
      }
      shapes.push({ type: "line", xref: `x${suffix} domain`, x0: 0, x1: 1, yref: `y${suffix}`, y0: t, y1: t, line: { color: GUIDE, width: 0.75, dash: "dash" } });
    });
    for (const d of Array.from(curve.deltaObjective as ArrayLike<number>)) if (Number.isFinite(d)) top = Math.max(top, Math.min(d, 12));
    const words = parameterLabel(curve.name).html;
    const label = words.charAt(0).toUpperCase() + words.slice(1);
    layoutAxes[`xaxis${suffix}`] = axisStyle(unit ? `${label} (${unit})` : label, { domain: [i * (width + gap), i * (width + gap) + width], anchor: `y${suffix}`, nticks: 4 });
    layoutAxes[`yaxis${suffix}`] = axisStyle(i === 0 ? "Δ<i>χ</i>²" : "", { anchor: `x${suffix}`, rangemode: "tozero" });
  });
  for (let i = 0; i < curves.length; i++) (layoutAxes[`yaxis${i === 0 ? "" : i + 1}`] as Record<string, unknown>).range = [0, top * 1.05];
  const layout = {
    ...baseLayout(size, {
      kind: "profile-likelihood",
      parameters: curves.map((c) => c.name),
      thresholds,
      best: curves.map((c) => (c.best !== undefined && c.uncertainty !== undefined ? formatQuantity(c.best, c.uncertainty, c.unit).text : null)),
    }),
    ...layoutAxes,
    shapes,
    annotations,
  };
  return withMimeBundle({ data, layout, config: { ...STATIC_CONFIG } });
}
