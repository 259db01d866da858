/**
 * A figure ready for rich display in the notebook with a static SVG beside the interactive
 * plotly description, so notebooks exported to HTML or PDF (where no plotly renderer runs)
 * still show the figure.
 */
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import { FigureRenderer } from "./exportFigure.js";

/** Something the kernel's display protocol shows richly (see kernel-ext/display.ts). */
export interface DisplayableFigure {
  figure: FigureSpec;
  svg: string;
  toMimeBundle(): Record<string, unknown>;
}

/**
 * Render `figure` to SVG (no browser: src/report/render) and return an object whose mime bundle holds
 * image/svg+xml, application/vnd.plotly.v1+json and text/plain.
 * Example (cell): `await displayableFigure(fitFigure(profile, result))` as the last expression.
 */
export async function displayableFigure(figure: FigureSpec, renderer?: FigureRenderer): Promise<DisplayableFigure> {
  const own = renderer ?? (await FigureRenderer.start());
  let svg: string;
  try {
    svg = new TextDecoder().decode(await own.render(figure, "svg"));
  } finally {
    if (!renderer) await own.close();
  }
  const plain = figure.toMimeBundle?.()["text/plain"] ?? `fringekit ${figure.layout.meta.kind} figure`;
  return {
    figure,
    svg,
    toMimeBundle: () => ({
      "image/svg+xml": svg,
      "application/vnd.plotly.v1+json": { data: figure.data, layout: figure.layout, config: figure.config },
      "text/plain": plain,
    }),
  };
}
