/**
 * Displayable report objects: a table that renders itself as HTML, Markdown, LaTeX or text,
 * and offers a MIME bundle for rich display in the notebook.
 */
import type { FitResult } from "../fit/types.js";
import type { ComparisonResult } from "../stats/comparisonTypes.js";
import { comparisonTable, type ComparisonTableOptions } from "./comparisonTable.js";
import { fitTable, type FitTableOptions } from "./fitTable.js";
import { quantityTable, type QuantityRow, type QuantityTableOptions } from "./quantityTable.js";
import { tableToHtml, tableToLatex, tableToLatexDocument, tableToMarkdown, type ReportTable } from "./table.js";
import { tableToText } from "./tableText.js";

/** MIME type → content, as in a Jupyter display_data message. */
export type MimeBundle = Record<string, unknown>;

/** A report table with its renderings. Create with fitReport or comparisonReport. */
export class TableReport {
  readonly table: ReportTable;
  constructor(table: ReportTable) {
    this.table = table;
  }
  /** HTML table (user strings escaped). */
  toHtml(): string {
    return tableToHtml(this.table);
  }
  /** GitHub-flavoured Markdown table. */
  toMarkdown(): string {
    return tableToMarkdown(this.table);
  }
  /** A LaTeX tabular that compiles with plain LaTeX. */
  toLatex(): string {
    return tableToLatex(this.table);
  }
  /** A complete LaTeX document containing the table. */
  toLatexDocument(): string {
    return tableToLatexDocument(this.table);
  }
  /** Aligned plain text. */
  toString(): string {
    return tableToText(this.table);
  }
  /** Rich display: text/html, text/markdown and text/plain. */
  toMimeBundle(): MimeBundle {
    return { "text/html": this.toHtml(), "text/markdown": this.toMarkdown(), "text/plain": this.toString() };
  }
}

/** The report of one fit (see fitTable for the content). */
export function fitReport(result: FitResult, options: FitTableOptions = {}): TableReport {
  return new TableReport(fitTable(result, options));
}

/**
 * The comparison report of a compareFits result (see comparisonTable); `compare(fits).report()`
 * is the one-line form.
 */
export function comparisonReport(comparison: ComparisonResult, options: ComparisonTableOptions = {}): TableReport {
  return new TableReport(comparisonTable(comparison, options));
}

/** The report of derived quantities, e.g. derivedQuantities(fit).quantities from stats. */
export function quantityReport(quantities: readonly QuantityRow[], options: QuantityTableOptions = {}): TableReport {
  return new TableReport(quantityTable(quantities, options));
}
