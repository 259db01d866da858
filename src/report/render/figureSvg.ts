/** One call from a figure description to its SVG file text. */
import type { FigureSpec } from "../figures/figureSpec.js";
import { figureScene } from "./figureScene.js";
import { sceneToSvg } from "./svg.js";

/**
 * SVG text of a figure from the figure builders, the same in Node and in the page: width and
 * height in mm (the figure's journal size), viewBox in CSS px, text as text, each trace one path.
 * @example writeFile("fig1.svg", figureSvg(fitFigure(profile, result)))
 */
export function figureSvg(figure: Pick<FigureSpec, "data" | "layout">): string {
  return sceneToSvg(figureScene(figure));
}
