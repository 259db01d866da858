/**
 * Correlation matrix of the free parameters as an annotated heat map on a diverging
 * scale (−1 navy, 0 white, +1 vermilion), so strongly coupled parameters stand out.
 */
import { InvalidArgumentError } from "../../errors.js";
import type { FitResult } from "../../fit/types.js";
import { parameterLabel } from "../labels.js";
import { STATIC_CONFIG, withMimeBundle, type FigureSpec } from "./figureSpec.js";
import { axisStyle, baseLayout, resolveSize, type FigureSize } from "./journal.js";
import { DIVERGING, INK } from "./palette.js";

/**
 * Heat map of result.correlation (dimensionless, −1…1) with each value printed in its cell.
 * Default size: single column (85 mm) × 75 mm. Takes a FitResult, or just its model id, free
 * parameter names and correlation matrix (row-major, as in FitResult).
 */
export function correlationFigure(result: Pick<FitResult, "modelId" | "freeNames" | "correlation">, options: FigureSize = {}): FigureSpec {
  const k = result.freeNames.length;
  if (k < 2) throw new InvalidArgumentError("result", `${k} free parameters`, "a fit with at least two free parameters");
  if (result.correlation.length !== k * k) {
    throw new InvalidArgumentError("result.correlation", `${result.correlation.length} entries`, `${k} × ${k} = ${k * k} entries`);
  }
  const size = resolveSize(options, 75);
  const labels = result.freeNames.map((n) => parameterLabel(n).html);
  // Row 0 at the top, as a matrix is read.
  const z: (number | null)[][] = [];
  const annotations: Record<string, unknown>[] = [];
  for (let r = 0; r < k; r++) {
    const row: (number | null)[] = [];
    for (let c = 0; c < k; c++) {
      const v = result.correlation[r * k + c];
      row.push(Number.isFinite(v) ? v : null);
      annotations.push({
        x: labels[c], y: labels[r], text: Number.isFinite(v) ? v.toFixed(2).replace(/^-0\.00$/, "0.00").replace("-", "−") : "–", showarrow: false,
        font: { size: size.fontPx * 0.9, color: Math.abs(v) > 0.6 ? "#ffffff" : INK },
      });
    }
    z.push(row);
  }
  const data = [
    {
      type: "heatmap", x: labels, y: labels, z, zmin: -1, zmax: 1, colorscale: DIVERGING,
      xgap: 1, ygap: 1, hoverongaps: false, name: "correlation",
      colorbar: { thickness: 8, len: 0.9, outlinewidth: 0, tickvals: [-1, -0.5, 0, 0.5, 1], ticks: "outside", ticklen: 2, title: { text: "<i>ρ</i>", side: "right" } },
    },
  ];
  const layout = {
    ...baseLayout(size, { kind: "correlation", modelId: result.modelId }),
    showlegend: false,
    xaxis: axisStyle("", { showline: false, mirror: false, ticks: "", side: "bottom", title: undefined, tickangle: -45 }),
    yaxis: axisStyle("", { showline: false, mirror: false, ticks: "", autorange: "reversed", title: undefined, scaleanchor: "x" }),
    annotations,
  };
  return withMimeBundle({ data, layout, config: { ...STATIC_CONFIG } });
}
