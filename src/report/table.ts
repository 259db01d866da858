/**
 * A small table model shared by fit and comparison reports, and its three renderings:
 * HTML (notebook display), Markdown and a LaTeX tabular that compiles with plain LaTeX.
 * Every string that can come from a user is escaped by the renderer, never by the caller.
 */
import { escapeHtml, escapeLatex, escapeMarkdown } from "./escape.js";
import { typographicMinus, type FormattedQuantity } from "./formatQuantity.js";
import type { ParameterLabel } from "./labels.js";

/** One cell: plain text (escaped on output), a formatted quantity, or a parameter label (pre-escaped per format). */
export type ReportTableCell = string | { quantity: FormattedQuantity } | { label: ParameterLabel };

/** A data row, or a section heading spanning the whole width. */
export type ReportTableRow = { cells: ReportTableCell[] } | { section: string };

/** A table of a report: caption, column names and alignment, rows, and notes under it. */
export interface ReportTable {
  caption: string;
  columns: string[];
  /** "l" or "r" per column (LaTeX and HTML alignment). */
  align: ("l" | "r")[];
  rows: ReportTableRow[];
  /** Footnotes printed under the table (warnings, the rounding rule, the data source). */
  notes: string[];
}

/** HTML table with caption and notes; inline styles only, so it survives notebook sanitisers. */
export function tableToHtml(table: ReportTable): string {
  const cell = (tag: string, content: string, align: string) => `<${tag} style="text-align:${align};padding:1px 8px">${content}</${tag}>`;
  const side = (i: number) => (table.align[i] === "r" ? "right" : "left");
  const head = table.columns.map((c, i) => cell("th", escapeHtml(c), side(i))).join("");
  const body = table.rows
    .map((row) =>
      "section" in row
        ? `<tr><th colspan="${table.columns.length}" style="text-align:left;padding:6px 8px 1px">${escapeHtml(row.section)}</th></tr>`
        : `<tr>${row.cells.map((c, i) => cell("td", cellHtml(c), side(i))).join("")}</tr>`,
    )
    .join("\n");
  const notes = table.notes.length
    ? `\n<tfoot>${table.notes.map((n) => `<tr><td colspan="${table.columns.length}" style="text-align:left;padding:1px 8px"><small>${escapeHtml(n)}</small></td></tr>`).join("")}</tfoot>`
    : "";
  return `<table class="fringekit-table" style="border-collapse:collapse;font-variant-numeric:tabular-nums">\n<caption>${escapeHtml(table.caption)}</caption>\n<thead><tr>${head}</tr></thead>\n<tbody>\n${body}\n</tbody>${notes}\n</table>`;
}

/** GitHub-flavoured Markdown table; the caption in bold above, notes as a list below. */
export function tableToMarkdown(table: ReportTable): string {
  const line = (cells: string[]) => `| ${cells.join(" | ")} |`;
  const lines = [`**${escapeMarkdown(table.caption)}**`, "", line(table.columns.map(escapeMarkdown))];
  lines.push(line(table.align.map((a) => (a === "r" ? "---:" : ":---"))));
  for (const row of table.rows) {
    if ("section" in row) lines.push(line([`*${escapeMarkdown(row.section)}*`, ...table.columns.slice(1).map(() => "")]));
    else lines.push(line(row.cells.map(cellMarkdown)));
  }
  if (table.notes.length) lines.push("", ...table.notes.map((n) => `- ${escapeMarkdown(n)}`));
  return lines.join("\n");
}

/**
 * A LaTeX tabular that compiles with plain LaTeX (no packages): the caption as a comment line
 * above it, notes as comment lines below (they belong in the caption or a footnote of the
 * paper). Use tableToLatexDocument for a complete file with caption and notes typeset.
 */
export function tableToLatex(table: ReportTable): string {
  const n = table.columns.length;
  const lines = [`% ${escapeLatex(table.caption)}`, `\\begin{tabular}{${table.align.join("")}}`, "\\hline"];
  lines.push(`${table.columns.map((c) => escapeLatex(c)).join(" & ")} \\\\`, "\\hline");
  for (const row of table.rows) {
    if ("section" in row) lines.push("\\hline", `\\multicolumn{${n}}{l}{\\textit{${escapeLatex(row.section)}}} \\\\`);
    else lines.push(`${row.cells.map(cellLatex).join(" & ")} \\\\`);
  }
  lines.push("\\hline", "\\end{tabular}");
  for (const note of table.notes) lines.push(`% ${escapeLatex(note)}`);
  return lines.join("\n");
}

/** A complete LaTeX document (article class, no packages) holding the table with its caption. */
export function tableToLatexDocument(table: ReportTable): string {
  return [
    "\\documentclass{article}",
    "\\begin{document}",
    "\\begin{table}[h]",
    "\\centering",
    `\\caption{${escapeLatex(table.caption)}}`,
    tableToLatex(table),
    ...(table.notes.length ? ["", "\\medskip", `{\\footnotesize ${table.notes.map((n) => escapeLatex(n)).join("\\par\n")}\\par}`] : []),
    "\\end{table}",
    "\\end{document}",
    "",
  ].join("\n");
}

function cellHtml(cell: ReportTableCell): string {
  if (typeof cell === "string") return escapeHtml(cell);
  if ("label" in cell) return cell.label.html;
  const q = cell.quantity;
  const unit = q.unit === "" ? "" : `&nbsp;${escapeHtml(q.unit)}`;
  const value = escapeHtml(typographicMinus(q.value));
  let core: string;
  if (q.uncertainty === null) core = `${value}${unit}`;
  else if (q.style === "paren") core = `${value}(${escapeHtml(q.uncertaintyDigits ?? "")})${unit}`;
  else core = q.unit === "" ? `${value} ± ${escapeHtml(q.uncertainty)}` : `(${value} ± ${escapeHtml(q.uncertainty)})${unit}`;
  return q.note === null ? core : `${core} <small>(${escapeHtml(q.note)})</small>`;
}

function cellMarkdown(cell: ReportTableCell): string {
  if (typeof cell === "string") return escapeMarkdown(cell);
  if ("label" in cell) return escapeMarkdown(cell.label.text);
  return escapeMarkdown(cell.quantity.text);
}

function cellLatex(cell: ReportTableCell): string {
  if (typeof cell === "string") return escapeLatex(cell);
  if ("label" in cell) return cell.label.latex;
  const q = cell.quantity;
  const unit = q.unit === "" ? "" : `\\,${escapeLatex(q.unit)}`;
  // Numbers come from our own formatter (digits, ".", "-") but are checked anyway before entering math mode.
  const num = (s: string) => (/^-?[0-9.]+$/.test(s) ? s : escapeLatex(s));
  let core: string;
  if (q.uncertainty === null) core = `$${num(q.value)}$${unit}`;
  else if (q.style === "paren") core = `$${num(q.value)}(${num(q.uncertaintyDigits ?? "")})$${unit}`;
  else if (q.unit === "") core = `$${num(q.value)} \\pm ${num(q.uncertainty)}$`;
  else core = `$(${num(q.value)} \\pm ${num(q.uncertainty)})$${unit}`;
  return q.note === null ? core : `${core} (${escapeLatex(q.note)})`;
}
