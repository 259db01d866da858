/**
 * Escaping of user-supplied strings (column names, file names, notes, model labels) for each
 * output format, so no string can inject markup, commands or break a table.
 */

const HTML_ENTITIES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };

/** Escape text for HTML element content and quoted attribute values (& < > " '). */
export function escapeHtml(text: string): string {
  return String(text).replace(/[&<>"']/g, (c) => HTML_ENTITIES[c]);
}

/**
 * Escape text for one Markdown table cell: markup characters get a backslash, HTML
 * specials become entities (notebook Markdown renders raw HTML), line breaks become spaces.
 */
export function escapeMarkdown(text: string): string {
  return stripControls(String(text))
    .replace(/\r\n|\r|\n/g, " ")
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/([\\`*_{}[\]()#+\-.!|~$])/g, "\\$1");
}

/** LaTeX specials and what stands for them in text mode (plain LaTeX, no packages). */
const LATEX_SPECIALS: Record<string, string> = {
  "\\": "\\textbackslash{}",
  "{": "\\{",
  "}": "\\}",
  $: "\\$",
  "&": "\\&",
  "#": "\\#",
  "%": "\\%",
  _: "\\_",
  "^": "\\textasciicircum{}",
  "~": "\\textasciitilde{}",
  "<": "\\textless{}",
  ">": "\\textgreater{}",
  "|": "\\textbar{}",
  '"': "{\\char34}",
  "-": "-{}",
  "`": "\\textasciigrave{}",
  "'": "\\textquotesingle{}",
};

/** Non-ASCII characters that plain LaTeX (2020 or later, no extra packages) can typeset. */
const LATEX_UNICODE: Record<string, string> = {
  "µ": "\\textmu{}",
  "\u03bc": "\\textmu{}",
  "±": "\\textpm{}",
  "°": "\\textdegree{}",
  "\u2212": "\\textminus{}",
  "×": "\\texttimes{}",
  "²": "\\texttwosuperior{}",
  "¹": "\\textonesuperior{}",
  "⁻": "\\textsuperscript{-}",
  "⁴": "\\textsuperscript{4}",
  "³": "\\textthreesuperior{}",
  "é": "\\'{e}",
  "è": "\\`{e}",
  "ü": "\\\"{u}",
  "ö": "\\\"{o}",
  "ä": "\\\"{a}",
  "ß": "\\ss{}",
  "\u2013": "--",
  "\u2014": "---",
  "\u03bb": "\\ensuremath{\\lambda}",
  "\u03c6": "\\ensuremath{\\varphi}",
  "\u03c3": "\\ensuremath{\\sigma}",
  "\u03c7": "\\ensuremath{\\chi}",
  "\u03b3": "\\ensuremath{\\gamma}",
  "\u0394": "\\ensuremath{\\Delta}",
  "\u03bd": "\\ensuremath{\\nu}",
  "\u2026": "\\ldots{}",
  "\u2032": "\\ensuremath{'}",
  "\u221e": "\\ensuremath{\\infty}",
  "\u2009": "\\,",
  "\u00a0": "~",
};

/**
 * Escape text for LaTeX text mode. Every special character is neutralised (so "\input",
 * "\write18" or "$" in a file name print as text); other non-ASCII characters print as
 * [U+XXXX] rather than break a pdfLaTeX run.
 */
export function escapeLatex(text: string): string {
  let out = "";
  for (const c of stripControls(String(text)).replace(/\r\n|\r|\n/g, " ")) {
    if (c in LATEX_SPECIALS) out += LATEX_SPECIALS[c];
    else if (c in LATEX_UNICODE) out += LATEX_UNICODE[c];
    else if (c.codePointAt(0)! > 0x7e) out += `[U+${c.codePointAt(0)!.toString(16).toUpperCase().padStart(4, "0")}]`;
    else out += c;
  }
  return out;
}

/** Drop C0/C1 control characters except line breaks and tab (they have no place in a report). */
function stripControls(text: string): string {
  // eslint-disable-next-line no-control-regex
  return text.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/g, "").replace(/\t/g, " ");
}
