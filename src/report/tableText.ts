/** Plain-text rendering of a report table, columns padded for a monospace terminal. */
import type { ReportTable, ReportTableCell } from "./table.js";

/** Render `table` as aligned plain text (for `text/plain` display and the command line). */
export function tableToText(table: ReportTable): string {
  const text = (c: ReportTableCell) => (typeof c === "string" ? c : "label" in c ? c.label.text : c.quantity.text);
  const body = table.rows.map((r) => ("section" in r ? null : r.cells.map(text)));
  const widths = table.columns.map((c, i) =>
    Math.max([...c].length, ...body.map((cells) => (cells ? [...(cells[i] ?? "")].length : 0))),
  );
  const pad = (s: string, i: number) =>
    table.align[i] === "r" ? s.padStart(widths[i] + s.length - [...s].length) : s.padEnd(widths[i] + s.length - [...s].length);
  const line = (cells: string[]) => cells.map(pad).join("  ").trimEnd();
  const out = [table.caption, line(table.columns), widths.map((w) => "-".repeat(w)).join("  ")];
  table.rows.forEach((r, i) => out.push("section" in r ? `${r.section}:` : line(body[i]!)));
  for (const n of table.notes) out.push(`  ${n}`);
  return out.join("\n");
}
