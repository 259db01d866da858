/**
 * The subset of plotly's text markup the figure builders write (<i>, <sup>, <sub>, <b>, <br>
 * and HTML entities) as runs of plain text with a style, and text widths from the font metrics.
 */
import { ITALIC_WIDTHS, REGULAR_WIDTHS } from "./fontMetrics.js";

/** A piece of text with one style: italic or not, raised (superscript), lowered (subscript) or on the baseline. */
export interface TextRun {
  text: string;
  italic: boolean;
  shift: "sup" | "sub" | null;
}

/** Size of superscripts and subscripts relative to the text (plotly draws them at 70 %). */
export const SCRIPT_SCALE = 0.7;
/** Baseline shift of superscripts (up) and subscripts (down), in ems of the surrounding text. */
export const SCRIPT_SHIFT = { sup: -0.38, sub: 0.22 } as const;

const NAMED: Record<string, string> = { amp: "&", lt: "<", gt: ">", quot: '"', apos: "'", nbsp: "\u00a0", minus: "−", times: "×", middot: "·", plusmn: "±", micro: "µ" };

/** Decode HTML entities (named ones above, decimal and hexadecimal). */
export function decodeEntities(text: string): string {
  return text.replace(/&(#x[0-9a-f]+|#\d+|[a-z]+);/gi, (whole, body: string) => {
    if (body[0] === "#") {
      const code = body[1] === "x" || body[1] === "X" ? parseInt(body.slice(2), 16) : parseInt(body.slice(1), 10);
      return Number.isFinite(code) && code > 0 && code < 0x110000 ? String.fromCodePoint(code) : whole;
    }
    return NAMED[body.toLowerCase()] ?? whole;
  });
}

/**
 * Split plotly text markup into styled runs. Unknown tags are dropped (their text kept);
 * <br> becomes a space (figure labels are one line).
 * @param markup plotly text, e.g. "Intensity <i>I</i> (10<sup>3</sup> counts)"
 */
export function parseMarkup(markup: string): TextRun[] {
  const runs: TextRun[] = [];
  let italic = 0;
  let shift: TextRun["shift"] = null;
  const push = (raw: string) => {
    const text = decodeEntities(raw);
    if (!text) return;
    const last = runs[runs.length - 1];
    if (last && last.italic === italic > 0 && last.shift === shift) last.text += text;
    else runs.push({ text, italic: italic > 0, shift });
  };
  const tag = /<(\/?)([a-z]+)[^>]*>/gi;
  let at = 0;
  for (let m = tag.exec(markup); m; m = tag.exec(markup)) {
    push(markup.slice(at, m.index));
    at = m.index + m[0].length;
    const closing = m[1] === "/";
    const name = m[2]!.toLowerCase();
    if (name === "i" || name === "em") italic = Math.max(0, italic + (closing ? -1 : 1));
    else if (name === "sup" || name === "sub") shift = closing ? null : name;
    else if (name === "br") push(" ");
  }
  push(markup.slice(at));
  return runs;
}

/** The text of runs without styles (for descriptions and search). */
export function plainText(runs: readonly TextRun[]): string {
  return runs.map((r) => r.text).join("");
}

/**
 * Estimated advance width (px) of styled runs at font size `sizePx`, from Liberation Sans
 * metrics (Arial-compatible); characters outside the table count 0.556 em.
 */
export function runsWidth(runs: readonly TextRun[], sizePx: number): number {
  let width = 0;
  for (const run of runs) {
    const table = run.italic ? ITALIC_WIDTHS : REGULAR_WIDTHS;
    const size = run.shift ? sizePx * SCRIPT_SCALE : sizePx;
    let em = 0;
    for (const ch of run.text) em += table[ch] ?? 556;
    width += (em / 1000) * size;
  }
  return width;
}

/** Estimated width (px) of plotly text markup at `sizePx`. */
export function textWidth(markup: string, sizePx: number): number {
  return runsWidth(parseMarkup(markup), sizePx);
}
