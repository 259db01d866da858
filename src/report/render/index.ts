// Figure rendering without a browser (pure: no DOM, no Node): re-exports only.
export type { Scene, SceneItem, PathItem, TextItem, GroupItem } from "./scene.js";
export type { TextRun } from "./markup.js";
export { parseMarkup } from "./markup.js";
export { figureScene } from "./figureScene.js";
export { sceneToSvg } from "./svg.js";
export { figureSvg } from "./figureSvg.js";
