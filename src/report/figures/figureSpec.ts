/**
 * A figure description: a plain plotly.js figure {data, layout, config} (JSON-safe: arrays,
 * not typed arrays), the same object the widgets draw and the exporter renders.
 */
import { escapeHtml } from "../escape.js";

/** Which composition a figure is; kept in layout.meta.kind. */
export type FigureKind = "fit" | "comparison" | "coherence-scan" | "correlation" | "profile-likelihood";

/** A plotly figure {data, layout, config}; layout.width/height in CSS px, layout.meta with the physical size. */
export interface FigureSpec {
  data: Record<string, unknown>[];
  layout: Record<string, unknown> & { width: number; height: number; meta: FigureMeta };
  config: Record<string, unknown>;
  /** Rich display in the notebook: the plotly mime type plus a text description. */
  toMimeBundle?(): Record<string, unknown>;
}

/** What the figure is and its physical size (mm) and text size (pt); kept in layout.meta. */
export interface FigureMeta {
  kind: FigureKind;
  widthMm: number;
  heightMm: number;
  fontPt: number;
  [key: string]: unknown;
}

/** Static figures: no mode bar, no logo, no editing; widgets may replace this config. */
export const STATIC_CONFIG = { displayModeBar: false, displaylogo: false, responsive: false, editable: false } as const;

/**
 * Finish a figure: axis titles at the text size and tick labels one point smaller (plotly
 * would otherwise enlarge titles), then attach toMimeBundle (non-enumerable, so
 * JSON.stringify gives the plain figure).
 */
export function withMimeBundle(figure: Omit<FigureSpec, "toMimeBundle">): FigureSpec {
  const spec = figure as FigureSpec;
  const font = spec.layout.font as { size: number } | undefined;
  if (font) {
    const tickSize = font.size * (spec.layout.meta.fontPt - 1) / spec.layout.meta.fontPt;
    for (const [key, axis] of Object.entries(spec.layout)) {
      if (!/^[xy]axis\d*$/.test(key) || !axis || typeof axis !== "object") continue;
      const a = axis as Record<string, unknown>;
      a.tickfont = { size: tickSize };
      if (a.title && typeof a.title === "object") (a.title as Record<string, unknown>).font = { size: font.size };
    }
    for (const trace of spec.data) {
      const colorbar = trace.colorbar as Record<string, unknown> | undefined;
      if (colorbar) colorbar.tickfont = { size: tickSize };
    }
  }
  Object.defineProperty(spec, "toMimeBundle", {
    enumerable: false,
    value: () => ({
      "application/vnd.plotly.v1+json": { data: spec.data, layout: spec.layout, config: spec.config },
      "text/plain": `fringekit ${spec.layout.meta.kind} figure, ${spec.layout.meta.widthMm} × ${spec.layout.meta.heightMm} mm, ${spec.data.length} traces`,
    }),
  });
  return spec;
}

/** Plain number array for JSON, each value (any unit) times `scale` (NaN and ±Infinity become null, which plotly draws as a gap). */
export function plainArray(values: ArrayLike<number>, scale = 1): (number | null)[] {
  const out = new Array<number | null>(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i] * scale;
    out[i] = Number.isFinite(v) ? v : null;
  }
  return out;
}

/** Escape user text (labels, units, names) for plotly, which reads a subset of HTML in strings. */
export function plotlyText(text: string): string {
  return escapeHtml(text);
}
