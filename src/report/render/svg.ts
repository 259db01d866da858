/** SVG text of a Scene: physical size in mm, viewBox in CSS px, one element per path or text line. */
import { escapeHtml } from "../escape.js";
import { SCRIPT_SCALE, SCRIPT_SHIFT } from "./markup.js";
import { num, type PathItem, type Scene, type SceneItem, type TextItem } from "./scene.js";

/**
 * A pixel frame for rasterising part of a scene: the document is `width` × `height` pixels and
 * shows the scene's rectangle `viewBox` [x, y, w, h] (CSS px) in it, with w/h = width/height.
 */
export interface SvgFrame {
  /** Document size (px). */
  width: number;
  height: number;
  /** The part of the scene shown, in the scene's CSS px: [x, y, w, h]. */
  viewBox: [number, number, number, number];
}

/**
 * The SVG 1.1 document of `scene`: width and height in mm (so it prints at journal size),
 * viewBox in CSS px, text as text (searchable, editable) in the scene's font family.
 * With `frame` the document is sized in pixels and shows only `frame.viewBox` of the scene
 * (how the PNG writer draws a figure in horizontal bands, one per thread).
 */
export function sceneToSvg(scene: Scene, frame?: SvgFrame): string {
  const out: string[] = [];
  let clipCount = 0;
  const write = (item: SceneItem) => {
    if (item.type === "path") out.push(pathElement(item));
    else if (item.type === "text") out.push(textElement(item));
    else {
      const id = `clip${clipCount++}`;
      const c = item.clip;
      out.push(`<clipPath id="${id}"><rect x="${num(c.x)}" y="${num(c.y)}" width="${num(c.width)}" height="${num(c.height)}"/></clipPath><g clip-path="url(#${id})">`);
      item.items.forEach(write);
      out.push("</g>");
    }
  };
  scene.items.forEach(write);
  return (
    // No XML declaration: UTF-8 is XML's default, and an SVG that starts with <svg embeds anywhere.
    `<svg xmlns="http://www.w3.org/2000/svg" ${frame ? framed(frame) : `width="${scene.widthMm}mm" height="${scene.heightMm}mm" viewBox="0 0 ${scene.width} ${scene.height}"`} font-family="${escapeHtml(scene.fontFamily)}">\n` +
    `<rect width="${scene.width}" height="${scene.height}" fill="${scene.background}"/>\n` +
    `${out.join("\n")}\n</svg>\n`
  );
}

/** Root size and viewBox of a framed document, full precision so that band edges meet on pixel rows. */
function framed(frame: SvgFrame): string {
  return `width="${frame.width}" height="${frame.height}" viewBox="${frame.viewBox.join(" ")}" preserveAspectRatio="none"`;
}

function pathElement(p: PathItem): string {
  const a: string[] = [`d="${p.d}"`];
  a.push(`fill="${p.fill ?? "none"}"`);
  if (p.fill && p.fillOpacity !== undefined && p.fillOpacity < 1) a.push(`fill-opacity="${round3(p.fillOpacity)}"`);
  if (p.stroke) {
    a.push(`stroke="${p.stroke}"`, `stroke-width="${round3(p.strokeWidth ?? 1)}"`);
    if (p.strokeOpacity !== undefined && p.strokeOpacity < 1) a.push(`stroke-opacity="${round3(p.strokeOpacity)}"`);
    if (p.dash?.length) a.push(`stroke-dasharray="${p.dash.map(round3).join(" ")}"`);
    if (p.cap === "round") a.push(`stroke-linecap="round"`);
    if (p.join === "round") a.push(`stroke-linejoin="round"`);
  }
  return `<path ${a.join(" ")}/>`;
}

function textElement(t: TextItem): string {
  const attrs = [`x="${num(t.x)}"`, `y="${num(t.y)}"`, `font-size="${round3(t.size)}"`, `fill="${t.color}"`];
  if (t.anchor !== "start") attrs.push(`text-anchor="${t.anchor}"`);
  if (t.rotate) attrs.push(`transform="rotate(${round3(t.rotate)} ${num(t.x)} ${num(t.y)})"`);
  // Scripts shift the baseline with dy and shift it back on the next run.
  let offset = 0;
  const spans = t.runs.map((run) => {
    const want = run.shift ? SCRIPT_SHIFT[run.shift] * t.size : 0;
    const dy = want - offset;
    offset = want;
    const a: string[] = [];
    if (run.italic) a.push(`font-style="italic"`);
    if (run.shift) a.push(`font-size="${round3(t.size * SCRIPT_SCALE)}"`);
    if (Math.abs(dy) > 1e-6) a.push(`dy="${round3(dy)}"`);
    const text = escapeHtml(run.text.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f]/g, ""));
    return a.length ? `<tspan ${a.join(" ")}>${text}</tspan>` : text;
  });
  return `<text ${attrs.join(" ")}>${spans.join("")}</text>`;
}

function round3(v: number): string {
  return String(Math.round(v * 1000) / 1000);
}
