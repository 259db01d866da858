/**
 * The prose of an offline notebook page: Markdown cells rendered as Markdown (markdown-it,
 * CommonMark with GFM tables), TeX math typeset offline by KaTeX (the fonts the math uses
 * inlined as data URLs, so the page needs no network), code cells coloured by highlight.js, and a table of
 * contents from the headings for long notebooks. No script is emitted: raw HTML in Markdown is
 * shown as text, link targets pass markdown-it's URL check (no javascript:), and KaTeX runs with
 * `trust: false` (no \href, \url, \includegraphics targets).
 */
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import hljs from "highlight.js/lib/core";
import bash from "highlight.js/lib/languages/bash";
import javascript from "highlight.js/lib/languages/javascript";
import json from "highlight.js/lib/languages/json";
import python from "highlight.js/lib/languages/python";
import typescript from "highlight.js/lib/languages/typescript";
import katex from "katex";
import MarkdownIt, { type StateBlock, type StateInline } from "markdown-it";
import { escapeHtml } from "../../src/report/escape.js";

hljs.registerLanguage("typescript", typescript);
hljs.registerLanguage("javascript", javascript);
hljs.registerLanguage("python", python);
hljs.registerLanguage("bash", bash);
hljs.registerLanguage("json", json);

/** One heading of the notebook's Markdown, for the table of contents. */
export interface NotebookHeading {
  /** 1 for `#`, 2 for `##`, … */
  level: number;
  /** Plain text of the heading. */
  text: string;
  /** Element id given to the heading (prefixed, so it cannot shadow the page's own ids). */
  id: string;
}

/** Renders the cells of one notebook page; keeps the headings and whether math occurred. */
export interface NotebookProse {
  /** HTML for one Markdown cell's source. */
  markdown(source: string): string;
  /** HTML (`<pre class="fk-code">`) for one code cell's source, coloured when the language is known. */
  code(source: string, language?: string): string;
  /** Headings seen so far, in order. */
  headings(): NotebookHeading[];
  /** A `<nav>` listing the headings (levels 1–3), or "" for a notebook with fewer than `minHeadings`. */
  tableOfContents(minHeadings?: number): string;
  /** CSS for the prose and code colours, plus KaTeX's when any math was rendered (the fonts it uses inlined). */
  css(): string;
}

/** TeX to HTML with KaTeX; a TeX error shows as the source in red instead of failing the page. */
function tex(source: string, displayMode: boolean): string {
  return katex.renderToString(source, { displayMode, throwOnError: false, output: "html", trust: false, strict: "ignore", maxExpand: 1000, maxSize: 50 });
}

/** Inline `$…$` (and `$$…$$` inside a paragraph): the opening `$` is not followed by a space, the closing one not preceded by a space nor followed by a digit (so "$5 and $10" stays text). */
function inlineMath(state: StateInline, silent: boolean): boolean {
  const src = state.src;
  const start = state.pos;
  if (src.charCodeAt(start) !== 0x24 /* $ */) return false;
  const display = src.charCodeAt(start + 1) === 0x24;
  const open = display ? 2 : 1;
  if (/\s/.test(src[start + open] ?? " ")) return false;
  let end = start + open;
  for (;;) {
    end = src.indexOf(display ? "$$" : "$", end);
    if (end < 0) return false;
    if (src[end - 1] === "\\") { end += 1; continue; }
    break;
  }
  if (end === start + open || /\s/.test(src[end - 1]!)) return false;
  if (!display && /\d/.test(src[end + 1] ?? "")) return false;
  if (!silent) {
    const token = state.push(display ? "math_display" : "math_inline", "", 0);
    token.content = src.slice(start + open, end);
  }
  state.pos = end + open;
  return true;
}

/** A display block: a line starting with `$$`, up to the line that ends with `$$`. */
function blockMath(state: StateBlock, startLine: number, endLine: number, silent: boolean): boolean {
  const first = state.src.slice(state.bMarks[startLine]! + state.tShift[startLine]!, state.eMarks[startLine]);
  if (!first.startsWith("$$")) return false;
  if (silent) return true;
  let content = first.slice(2);
  let line = startLine;
  let closed = content.trimEnd().endsWith("$$");
  if (closed) content = content.trimEnd().slice(0, -2);
  while (!closed && ++line < endLine) {
    const text = state.src.slice(state.bMarks[line]! + state.tShift[line]!, state.eMarks[line]);
    if (text.trimEnd().endsWith("$$")) { content += `\n${text.trimEnd().slice(0, -2)}`; closed = true; } else content += `\n${text}`;
  }
  if (!closed) return false;
  state.line = line + 1;
  const token = state.push("math_display", "", 0);
  token.block = true;
  token.content = content.trim();
  token.map = [startLine, state.line];
  return true;
}

/** Heading text to an id fragment: lower case letters and digits joined by hyphens. */
function slug(text: string): string {
  return text.normalize("NFKD").toLowerCase().replace(/[^\p{L}\p{N}]+/gu, "-").replace(/^-+|-+$/g, "") || "section";
}

let katexCss: string | undefined;
/** KaTeX's stylesheet with each font as a woff2 data URL (the woff/ttf fallbacks dropped). */
function katexStylesheet(): string {
  if (katexCss === undefined) {
    const dist = path.dirname(createRequire(import.meta.url).resolve("katex"));
    const css = readFileSync(path.join(dist, "katex.min.css"), "utf8");
    katexCss = css.replace(/src:url\(fonts\/([\w-]+)\.woff2\) format\("woff2"\)[^;}]*/g, (_, font: string) =>
      `src:url(data:font/woff2;base64,${readFileSync(path.join(dist, "fonts", `${font}.woff2`)).toString("base64")}) format("woff2")`);
  }
  return katexCss;
}

/**
 * KaTeX's stylesheet with only the font faces the typeset math can use. A rule of KaTeX's own
 * stylesheet applies when every class of one of its selectors occurs in the math (e.g.
 * `.katex .mathfrak` → KaTeX_Fraktur); a family is kept when an applying rule names it
 * (KaTeX_Main always: the `.katex` base font), and its bold or italic faces only when an
 * applying rule asks for bold or italic (for that family, or for any when the rule names none,
 * as `.textbf` does). All twenty faces are ~350 KB in the page; a plain formula needs four.
 * @param classes every class name in the typeset math's HTML
 */
export function katexStylesheetFor(classes: ReadonlySet<string>): string {
  const css = katexStylesheet();
  const faces = /@font-face\{[^}]*\}/g;
  const used = new Map<string, { bold: boolean; italic: boolean }>();
  const anyFamily = { bold: false, italic: false };
  for (const rule of css.replace(faces, "").matchAll(/([^{}]+)\{([^}]*)\}/g)) {
    const body = rule[2]!;
    const bold = /font-weight:(?:700|bold)/.test(body);
    const italic = /font-style:italic/.test(body);
    const families = [...body.matchAll(/KaTeX_\w+/g)].map((m) => m[0]);
    if (families.length === 0 && !bold && !italic) continue;
    const selectors = rule[1]!.split(",").map((selector) => [...selector.matchAll(/\.([\w-]+)/g)].map((m) => m[1]!).filter((c) => c !== "katex"));
    if (!selectors.some((needed) => needed.every((c) => classes.has(c)))) continue;
    if (families.length === 0) {
      anyFamily.bold ||= bold;
      anyFamily.italic ||= italic;
    }
    for (const family of families) {
      const styles = used.get(family) ?? { bold: false, italic: false };
      used.set(family, { bold: styles.bold || bold, italic: styles.italic || italic });
    }
  }
  return css.replace(faces, (face) => {
    const styles = used.get(/font-family:"?(KaTeX_\w+)/.exec(face)?.[1] ?? "");
    if (!styles) return "";
    const boldFace = /font-weight:(?:700|bold)/.test(face);
    const italicFace = /font-style:italic/.test(face);
    return (!boldFace || styles.bold || anyFamily.bold) && (!italicFace || styles.italic || anyFamily.italic) ? face : "";
  });
}

// Our own colours (the project palette's navy, vermilion, teal and ochre, darkened for text).
const PROSE_CSS = `
.fk-md { line-height: 1.55; }
.fk-md h1, .fk-md h2, .fk-md h3 { line-height: 1.25; margin: 1.1em 0 0.45em; }
.fk-md h1 { font-size: 1.6em; } .fk-md h2 { font-size: 1.3em; } .fk-md h3 { font-size: 1.1em; }
.fk-md blockquote { margin: 0.8em 0; padding: 0.5em 1em; border-left: 4px solid #d9a93b; background: #fdf8ec; }
.fk-md blockquote > :first-child { margin-top: 0; } .fk-md blockquote > :last-child { margin-bottom: 0; }
.fk-md code { background: #f1f5f9; padding: 0 3px; border-radius: 3px; font-size: 0.92em; }
.fk-md pre { background: #f8fafc; padding: 8px 10px; overflow-x: auto; }
.fk-md pre code { background: none; padding: 0; }
.fk-md table { border-collapse: collapse; margin: 0.6em 0; }
.fk-md th, .fk-md td { border: 1px solid #cbd5e1; padding: 3px 8px; }
.fk-md th { background: #f1f5f9; }
.fk-md img { max-width: 100%; }
.fk-md .katex-display { overflow-x: auto; overflow-y: hidden; padding: 2px 0; }
nav.fk-toc { border: 1px solid #cbd5e1; background: #f8fafc; padding: 8px 14px; margin: 8px 0 18px; display: inline-block; min-width: 40%; }
nav.fk-toc ol { margin: 4px 0; padding-left: 1.3em; }
nav.fk-toc .fk-toc-title { font-weight: 600; }
nav.fk-toc li.fk-toc-2 { margin-left: 1.2em; } nav.fk-toc li.fk-toc-3 { margin-left: 2.4em; font-size: 0.95em; }
nav.fk-toc li { list-style: none; }
pre.fk-code .hljs-keyword, pre.fk-code .hljs-built_in, pre.fk-code .hljs-literal { color: #143d73; font-weight: 600; }
pre.fk-code .hljs-string, pre.fk-code .hljs-regexp { color: #2c7a74; }
pre.fk-code .hljs-number { color: #b0442a; }
pre.fk-code .hljs-comment { color: #64748b; font-style: italic; }
pre.fk-code .hljs-title, pre.fk-code .hljs-title.function_ { color: #7a5a12; }
pre.fk-code .hljs-type, pre.fk-code .hljs-title.class_ { color: #6b3fa0; }
pre.fk-code .hljs-attr, pre.fk-code .hljs-property { color: #1e293b; }
`;

const LANGUAGE_ALIASES: Record<string, string> = { ts: "typescript", typescript: "typescript", js: "javascript", javascript: "javascript", python: "python", py: "python", sh: "bash", bash: "bash", json: "json" };

/**
 * A renderer for one page (headings and the math flag are per page).
 * Markdown: CommonMark + GFM tables + linkified URLs; `$…$` and `$$…$$` TeX; raw HTML escaped.
 */
export function createNotebookProse(): NotebookProse {
  const headings: NotebookHeading[] = [];
  const used = new Set<string>();
  let math = false;
  const md = new MarkdownIt({ html: false, linkify: true, typographer: false });
  md.inline.ruler.before("escape", "math_inline", inlineMath);
  md.block.ruler.before("fence", "math_block", blockMath, { alt: ["paragraph", "reference", "blockquote", "list"] });
  // Class names of all typeset math, so the page carries only the fonts it uses.
  const mathClasses = new Set<string>();
  const typeset = (source: string, display: boolean) => {
    math = true;
    const html = tex(source, display);
    for (const [, names] of html.matchAll(/class="([^"]*)"/g)) for (const name of names!.split(/\s+/)) if (name) mathClasses.add(name);
    return html;
  };
  md.renderer.rules.math_inline = (tokens, i) => typeset(tokens[i]!.content, false);
  md.renderer.rules.math_display = (tokens, i) => tokens[i]!.block ? `<div class="fk-math">${typeset(tokens[i]!.content, true)}</div>\n` : typeset(tokens[i]!.content, true);
  // Fenced code inside Markdown gets the same colours as code cells.
  md.options.highlight = (code, lang) => {
    const language = LANGUAGE_ALIASES[lang.toLowerCase()];
    return language ? hljs.highlight(code, { language, ignoreIllegals: true }).value : "";
  };
  md.core.ruler.push("fk_heading_ids", (state) => {
    const tokens = state.tokens;
    for (let i = 0; i < tokens.length; i++) {
      if (tokens[i]!.type !== "heading_open") continue;
      const text = (tokens[i + 1]?.children ?? []).filter((t) => t.type === "text" || t.type === "code_inline" || t.type.startsWith("math")).map((t) => t.content).join("").trim();
      let id = `fk-h-${slug(text)}`;
      for (let n = 2; used.has(id); n++) id = `fk-h-${slug(text)}-${n}`;
      used.add(id);
      tokens[i]!.attrSet("id", id);
      headings.push({ level: Number(tokens[i]!.tag.slice(1)), text, id });
    }
  });

  return {
    markdown: (source) => md.render(source),
    code(source, language) {
      const name = LANGUAGE_ALIASES[(language ?? "").toLowerCase()];
      const body = name ? hljs.highlight(source, { language: name, ignoreIllegals: true }).value : escapeHtml(source);
      return `<pre class="fk-code"><code${name ? ` class="hljs language-${name}"` : ""}>${body}</code></pre>`;
    },
    headings: () => [...headings],
    tableOfContents(minHeadings = 4) {
      const listed = headings.filter((h) => h.level <= 3);
      if (listed.length < minHeadings) return "";
      const items = listed.map((h) => `<li class="fk-toc-${h.level}"><a href="#${h.id}">${escapeHtml(h.text)}</a></li>`).join("");
      return `<nav class="fk-toc" aria-label="Contents"><div class="fk-toc-title">Contents</div><ol>${items}</ol></nav>`;
    },
    css: () => PROSE_CSS + (math ? katexStylesheetFor(mathClasses) : ""),
  };
}
