/**
 * What an offline HTML export lets through (README, "Limits and security"):
 * - HTML from the notebook (text/html outputs, widget fallbacks, rendered Markdown) passes an
 *   allowlist sanitiser (sanitize-html): no script, no event attribute, no `javascript:` or other
 *   non-listed URL scheme, no frames, objects, forms, `<style>`, `<base>` or `<meta>`; images only
 *   from `data:` URLs; comments dropped (an unclosed `<!--` cannot swallow the page).
 * - A Content-Security-Policy in the page allows only the inlined renderer script (by its
 *   SHA-256 hash), inline styles, `data:`/`blob:` images and fonts, and the fitter's blob Worker;
 *   every network fetch, frame, form target and base URL is refused by the browser.
 * - JSON in `<script type="application/...">` elements has `<`, `>`, `&`, U+2028 and U+2029
 *   escaped as `\uXXXX`, so no string in it can close the element or open a comment.
 */
import { createHash } from "node:crypto";
import sanitizeHtml from "sanitize-html";

/** CSS values that name no URL and run nothing (no `url(`, `image-set(`, `expression(` or `@import`). */
const SAFE_CSS_VALUE = [/^(?!.*(?:url|image|expression|element)\s*\()(?!.*@import)(?!.*\\)[^<>{}]*$/i];
const STYLE_PROPERTIES = [
  "color", "background-color", "font-size", "font-weight", "font-style", "font-family", "text-align", "vertical-align",
  "text-decoration", "white-space", "display", "position", "top", "left", "right", "bottom", "width", "height",
  "min-width", "max-width", "min-height", "max-height", "margin", "margin-left", "margin-right", "margin-top",
  "margin-bottom", "padding", "padding-left", "padding-right", "padding-top", "padding-bottom", "border",
  "border-top", "border-bottom", "border-left", "border-right", "border-collapse", "border-color", "border-style",
  "border-width", "line-height", "overflow", "transform", "opacity",
];
/** MathML and the SVG shapes math renderers emit (no `<use>`, `<foreignObject>`, `<script>`, links). */
const MATH_TAGS = ["math", "semantics", "annotation", "mrow", "mi", "mn", "mo", "ms", "mtext", "mspace", "msup", "msub", "msubsup",
  "mfrac", "msqrt", "mroot", "mover", "munder", "munderover", "mtable", "mtr", "mtd", "mstyle", "mpadded", "mphantom", "menclose"];
const SVG_TAGS = ["svg", "g", "path", "line", "rect", "circle", "polyline", "polygon"];
const SVG_ATTRIBUTES = ["viewbox", "viewBox", "width", "height", "d", "x", "y", "x1", "y1", "x2", "y2", "cx", "cy", "r", "points",
  "fill", "stroke", "stroke-width", "transform", "preserveaspectratio", "preserveAspectRatio", "xmlns"];

const OPTIONS: sanitizeHtml.IOptions = {
  allowedTags: [...sanitizeHtml.defaults.allowedTags.filter((t) => t !== "style"), "img", "del", "ins", "details", "summary", ...MATH_TAGS, ...SVG_TAGS],
  allowedAttributes: {
    "*": ["class", "title", "lang", "dir", "style", "role", "aria-*"],
    a: ["href"],
    img: ["src", "alt", "width", "height"],
    ...Object.fromEntries(["h1", "h2", "h3", "h4", "h5", "h6"].map((t) => [t, ["id"]])),
    td: ["colspan", "rowspan", "align"],
    th: ["colspan", "rowspan", "align", "scope"],
    ol: ["start", "type"],
    math: ["display", "xmlns"],
    annotation: ["encoding"],
    mo: ["stretchy", "fence", "separator", "lspace", "rspace"],
    mspace: ["width"],
    ...Object.fromEntries(SVG_TAGS.map((t) => [t, SVG_ATTRIBUTES])),
  },
  allowedSchemes: ["http", "https", "mailto"],
  allowedSchemesByTag: { img: ["data"] },
  allowProtocolRelative: false,
  allowedStyles: { "*": Object.fromEntries(STYLE_PROPERTIES.map((p) => [p, SAFE_CSS_VALUE])) },
  // Contents of these are dropped with the element, not kept as text.
  nonTextTags: ["script", "style", "textarea", "option", "noscript", "title", "template", "iframe", "object", "xmp", "noembed", "noframes"],
  // Links leave this page in a new browsing context that cannot reach it.
  transformTags: {
    a: sanitizeHtml.simpleTransform("a", { rel: "noopener noreferrer", target: "_blank" }),
    // Headings keep only the contents anchors the Markdown renderer makes ("fk-h-…"), so no
    // other id can shadow a name the page's script looks up.
    ...Object.fromEntries(["h1", "h2", "h3", "h4", "h5", "h6"].map((tag) => [tag, (tagName: string, attribs: sanitizeHtml.Attributes) => {
      const { id, ...rest } = attribs;
      return { tagName, attribs: id !== undefined && /^fk-h-[\p{L}\p{N}-]+$/u.test(id) ? { ...rest, id } : rest };
    }])),
  },
};
OPTIONS.allowedAttributes = { ...(OPTIONS.allowedAttributes as Record<string, string[]>), a: ["href", "rel", "target"] };

/**
 * Sanitise HTML from a notebook (an output, a widget fallback, rendered Markdown) for the
 * offline export, with the allowlist described in this module's comment.
 * @param html untrusted HTML text
 * @returns HTML that runs no script and names no resource outside the page (images only as data: URLs)
 */
export function sanitizeOutputHtml(html: string): string {
  return sanitizeHtml(html, OPTIONS);
}

/**
 * Serialise `value` as JSON for the body of a `<script type="application/...">` element:
 * `<`, `>`, `&`, U+2028 and U+2029 become `\uXXXX` escapes (still the same JSON value), so no
 * string can end the element (`</script>`) or open a comment (`<!--`).
 * @param value any JSON-serialisable value
 */
export function jsonForScript(value: unknown): string {
  return JSON.stringify(value).replace(/[<>&\u2028\u2029]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`);
}

/**
 * The page's Content-Security-Policy: only scripts whose text hashes to one of `scripts` run;
 * no network, frames, objects, forms or base URL.
 * @param scripts exact text content of each inline script allowed to run
 */
export function contentSecurityPolicy(scripts: readonly string[]): string {
  const hashes = scripts.map((s) => `'sha256-${createHash("sha256").update(s, "utf8").digest("base64")}'`).join(" ");
  return [
    "default-src 'none'", `script-src ${hashes}`, "style-src 'unsafe-inline'", "img-src data: blob:", "font-src data:",
    "worker-src blob:", "connect-src 'none'", "frame-src 'none'", "object-src 'none'", "media-src 'none'",
    "base-uri 'none'", "form-action 'none'",
  ].join("; ");
}
