/**
 * Reading labels for the project-wide parameter names, in plain text, HTML and LaTeX.
 * Symbols follow common practice in interference work (d slit separation, a slit width,
 * V visibility, L screen distance); unknown names fall back to the name itself, escaped.
 */
import { escapeHtml, escapeLatex } from "./escape.js";

/** A parameter's reading label in each output format. */
export interface ParameterLabel {
  /** Plain text, e.g. "separation d". */
  text: string;
  /** HTML, e.g. "separation <i>d</i>". */
  html: string;
  /** LaTeX text mode, e.g. "separation $d$". */
  latex: string;
}

const SYMBOLS: Record<string, [text: string, html: string, latex: string]> = {
  wavelength: ["λ", "<i>λ</i>", "$\\lambda$"],
  distance: ["L", "<i>L</i>", "$L$"],
  separation: ["d", "<i>d</i>", "$d$"],
  width: ["a", "<i>a</i>", "$a$"],
  slits: ["N", "<i>N</i>", "$N$"],
  center: ["x₀", "<i>x</i><sub>0</sub>", "$x_0$"],
  amplitude: ["I₀", "<i>I</i><sub>0</sub>", "$I_0$"],
  background: ["B", "<i>B</i>", "$B$"],
  backgroundSlope: ["B′", "<i>B</i>′", "$B'$"],
  visibility: ["V", "<i>V</i>", "$V$"],
  phase: ["φ", "<i>φ</i>", "$\\varphi$"],
  bandwidth: ["Δλ", "Δ<i>λ</i>", "$\\Delta\\lambda$"],
  pixelWidth: ["p", "<i>p</i>", "$p$"],
  blur: ["σ_b", "<i>σ</i><sub>b</sub>", "$\\sigma_\\mathrm{b}$"],
  beamWaist: ["w₀", "<i>w</i><sub>0</sub>", "$w_0$"],
  diameter: ["D", "<i>D</i>", "$D$"],
  rmsSize: ["σ_s", "<i>σ</i><sub>s</sub>", "$\\sigma_\\mathrm{s}$"],
  sourceDistance: ["R", "<i>R</i>", "$R$"],
};

/** Label of a parameter: its project-wide name followed by its usual symbol where there is one. */
export function parameterLabel(name: string): ParameterLabel {
  const words = name.replace(/([a-z])([A-Z])/g, "$1 $2").toLowerCase();
  const symbol = Object.prototype.hasOwnProperty.call(SYMBOLS, name) ? SYMBOLS[name] : undefined;
  if (!symbol) return { text: name, html: escapeHtml(name), latex: escapeLatex(name) };
  return {
    text: `${words} ${symbol[0]}`,
    html: `${escapeHtml(words)} ${symbol[1]}`,
    latex: `${escapeLatex(words)} ${symbol[2]}`,
  };
}
