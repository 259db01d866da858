/**
 * One call from a fit (or comparison, or coherence scan) to everything a paper needs:
 * the figure (PDF, SVG and/or PNG), the table (LaTeX document, LaTeX tabular, Markdown, HTML)
 * and the results file that re-runs it. Every file is written atomically.
 *
 * Example: await exportFitReport(profile, result, "out/fig2", { fitOptions, formats: ["pdf", "png"] })
 *   → out/fig2.pdf, out/fig2.png, out/fig2.tex, out/fig2-table.tex, out/fig2.md, out/fig2.html, out/fig2.json
 */
import path from "node:path";
import { InvalidArgumentError } from "../../src/errors.js";
import type { FitResult } from "../../src/fit/types.js";
import type { Model } from "../../src/physics/model.js";
import type { Profile } from "../../src/profile.js";
import type { NestedTestResult } from "../../src/stats/nested.js";
import type { LabelledFit } from "../../src/report/comparisonTable.js";
import type { FigureSpec } from "../../src/report/figures/figureSpec.js";
import type { FitFigureOptions } from "../../src/report/figures/fitFigure.js";
import type { DocumentOptions, FitToRecord, ResultsDocument } from "../../src/report/results/resultsDocument.js";
import type { TableReport } from "../../src/report/tableReport.js";
import { writeFileAtomic } from "./atomicWrite.js";
import { exportFigure, FigureRenderer, type FigureFormat } from "./exportFigure.js";

/**
 * The builders, tables and results documents, loaded on the first report: importing
 * fringekit/figures only to save a figure then costs tens of milliseconds less.
 */
async function reportParts() {
  const [{ fitFigure }, { comparisonFigure }, { coherenceScanFigure }, { compareFits }, results, tables] = await Promise.all([
    import("../../src/report/figures/fitFigure.js"),
    import("../../src/report/figures/comparisonFigure.js"),
    import("../../src/report/figures/coherenceScanFigure.js"),
    import("../../src/stats/compareFits.js"),
    import("../../src/report/results/resultsDocument.js"),
    import("../../src/report/tableReport.js"),
  ]);
  return { fitFigure, comparisonFigure, coherenceScanFigure, compareFits, ...results, ...tables };
}

/** Options of the one-call exports (figure formats, size, and what the results file records). */
export interface ExportReportOptions extends DocumentOptions {
  /** Figure formats to write (default ["pdf", "png"]). */
  formats?: FigureFormat[];
  /** PNG resolution (default 300 dpi). */
  dpi?: number;
  /** Figure size and labels. */
  figure?: FitFigureOptions;
  /** Options the fit(s) were made with, recorded in the results file. */
  fitOptions?: Record<string, unknown>;
  /** Model construction options, recorded in the results file. */
  modelOptions?: Record<string, unknown>;
  /** Table caption (user text, escaped). */
  caption?: string;
  /** Nested-model tests of a comparison (compareFits(...).tests), printed under its table. */
  tests?: readonly NestedTestResult[];
}

/** Paths of the files written. */
export interface ExportedReport {
  figures: string[];
  latexDocument: string;
  latexTable: string;
  markdown: string;
  html: string;
  results: string;
}

/** Figure, tables and results file of one fit, named `base`.{pdf,png,svg,tex,md,html,json}. */
export async function exportFitReport(profile: Profile, result: FitResult, base: string, options: ExportReportOptions = {}): Promise<ExportedReport> {
  const { fitFigure, fitReport, fitDocument } = await reportParts();
  const fit: FitToRecord = { result, fitOptions: options.fitOptions, modelOptions: options.modelOptions };
  return writeAll(base, fitFigure(profile, result, options.figure), fitReport(result, { caption: options.caption, source: profile.provenance?.source }), fitDocument(profile, fit, options), options, profile);
}

/** Figure, table and results file of a comparison of fits of one profile. */
export async function exportComparisonReport(profile: Profile, fits: readonly LabelledFit[], base: string, options: ExportReportOptions = {}): Promise<ExportedReport> {
  const { comparisonFigure, comparisonReport, comparisonDocument, compareFits } = await reportParts();
  const records = fits.map((f) => ({ label: f.label, result: f.result, fitOptions: options.fitOptions, modelOptions: options.modelOptions }));
  return writeAll(
    base,
    comparisonFigure(profile, fits, options.figure),
    // Ranked by stats (the report only lays the numbers out).
    comparisonReport(compareFits(fits.map((f) => ({ fit: f.result, label: f.label })), { profile }), { caption: options.caption, verdict: options.verdict, tests: options.tests, fits }),
    comparisonDocument(profile, records, options),
    options,
    profile,
  );
}

/** Figure, table and results file of a coherence-scan fit (scan: x = separation in m, y = visibility). */
export async function exportScanReport(scan: Profile, result: FitResult, model: Model, base: string, options: ExportReportOptions = {}): Promise<ExportedReport> {
  const { coherenceScanFigure, fitReport, scanDocument } = await reportParts();
  const fit: FitToRecord = { result, fitOptions: options.fitOptions, modelOptions: options.modelOptions };
  return writeAll(base, coherenceScanFigure(scan, result, model, options.figure), fitReport(result, { caption: options.caption, source: scan.provenance?.source }), scanDocument(scan, fit, options), options, scan);
}

async function writeAll(base: string, figure: FigureSpec, table: TableReport, doc: ResultsDocument, options: ExportReportOptions, data: Profile): Promise<ExportedReport> {
  if (typeof base !== "string" || base === "" || /\.(pdf|png|svg|json|tex|md|html)$/i.test(base)) {
    throw new InvalidArgumentError("base", base, "an output path without extension, e.g. out/figure2 (the extensions are added)");
  }
  const formats = options.formats ?? ["pdf", "png"];
  // Never write over the data: refuse any output named like the input file.
  const source = data.provenance?.source;
  const names = [...formats.map((f) => `${base}.${f}`), `${base}.tex`, `${base}-table.tex`, `${base}.md`, `${base}.html`, `${base}.json`];
  const clash = source ? names.find((n) => path.basename(n) === path.basename(source)) : undefined;
  if (clash) throw new InvalidArgumentError("base", base, `a name whose outputs do not include the data file ${source} (${clash} would replace it)`);
  // Write the cheap, pure outputs first: a figure failure (e.g. no fonts) still leaves the tables and results.
  const out: ExportedReport = {
    figures: [],
    latexDocument: `${base}.tex`,
    latexTable: `${base}-table.tex`,
    markdown: `${base}.md`,
    html: `${base}.html`,
    results: `${base}.json`,
  };
  const { stringifyResults } = await import("../../src/report/results/resultsDocument.js");
  await writeFileAtomic(out.results, stringifyResults(doc));
  await writeFileAtomic(out.latexDocument, table.toLatexDocument());
  await writeFileAtomic(out.latexTable, `${table.toLatex()}\n`);
  await writeFileAtomic(out.markdown, `${table.toMarkdown()}\n`);
  await writeFileAtomic(out.html, `<!doctype html>\n<meta charset="utf-8">\n${table.toHtml()}\n`);
  if (formats.length) {
    const renderer = await FigureRenderer.start();
    try {
      for (const format of formats) {
        const written = await exportFigure(figure, `${base}.${format}`, { format, dpi: options.dpi }, renderer);
        out.figures.push(written.path);
      }
    } finally {
      await renderer.close();
    }
  }
  return out;
}
