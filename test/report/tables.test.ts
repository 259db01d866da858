import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { escapeHtml, escapeLatex, escapeMarkdown } from "../../src/report/escape.js";
import { comparisonReport, fitReport, quantityReport } from "../../src/report/tableReport.js";
import { comparisonTable, testNote, type LabelledFit } from "../../src/report/comparisonTable.js";
import { comparisonRows } from "../../src/stats/comparisonRows.js";
import { compareFits } from "../../src/stats/compareFits.js";
import { HOSTILE, makeFitResult } from "./fixtures.js";

const PDFLATEX = "/usr/bin/pdflatex";

/** Compile a LaTeX document with shell escape off; returns the log. Throws with the log on failure. */
function compileLatex(source: string): { log: string; files: string[] } {
  const dir = mkdtempSync(join(tmpdir(), "fringekit-latex-"));
  try {
    writeFileSync(join(dir, "t.tex"), source);
    try {
      execFileSync(PDFLATEX, ["-interaction=nonstopmode", "-halt-on-error", "-no-shell-escape", "t.tex"], {
        cwd: dir, stdio: "pipe", timeout: 120_000,
      });
    } catch (error) {
      const log = existsSync(join(dir, "t.log")) ? execFileSync("cat", [join(dir, "t.log")]).toString() : String(error);
      throw new Error(`pdflatex failed:\n${log.split("\n").filter((l) => l.startsWith("!") || l.startsWith("l.")).join("\n")}`);
    }
    return { log: execFileSync("cat", [join(dir, "t.log")]).toString(), files: readdirSync(dir) };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

describe("escapeHtml / escapeMarkdown / escapeLatex (hostile strings)", () => {
  it("escapeHtml(s) leaves no tag or attribute break-out for any hostile string", () => {
    for (const s of HOSTILE) {
      const out = escapeHtml(s);
      expect(out).not.toMatch(/[<>"']/);
    }
    expect(escapeHtml(`<a href="x">&`)).toBe("&lt;a href=&quot;x&quot;&gt;&amp;");
  });
  it("escapeMarkdown(s) keeps one table cell: no bare pipe, no line break, no raw HTML", () => {
    for (const s of HOSTILE) {
      const out = escapeMarkdown(s);
      expect(out).not.toMatch(/(^|[^\\])\|/);
      expect(out).not.toMatch(/[\n<>]/);
    }
  });
  it("escapeLatex(s) leaves no unescaped special character and no raw non-ASCII", () => {
    for (const s of HOSTILE) {
      const out = escapeLatex(s);
      // A user's backslash becomes \textbackslash{}, so no command of theirs survives.
      expect(out).not.toMatch(/\\(input|write|end|begin|def|catcode)/);
      expect(out).not.toMatch(/(^|[^\\])[$&#%_]/);
      expect(out).not.toMatch(/[^\x20-\x7e]/);
    }
    expect(escapeLatex("a_b%c")).toBe("a\\_b\\%c");
  });
});

describe("fitReport(result, options)", () => {
  const result = makeFitResult({
    warnings: [{ code: "at-bound", message: "visibility sits at <1>", parameter: "visibility" }],
  });
  const report = fitReport(result, { source: HOSTILE[0], notes: HOSTILE.slice(1) });

  it("fitReport(...).toHtml() shows every parameter with GUM rounding and marks fixed ones", () => {
    const html = report.toHtml();
    expect(html).toContain("(500.12 ± 0.34)&nbsp;µm"); // 5.00123e-4 ± 3.41e-7 m, hand-checked
    expect(html).toContain("0.8501 ± 0.0012");
    expect(html).toContain("632.8&nbsp;nm <small>(fixed)</small>");
    expect(html).toContain("(20004 ± 21)&nbsp;counts");
    expect(html).toContain("58.3/57 = 1.023"); // χ²/ν, 58.3/57 hand-checked
  });
  it("fitReport(...).toHtml() escapes the hostile source, notes and warnings", () => {
    const html = report.toHtml();
    expect(html).not.toContain("<script");
    expect(html).not.toContain("<img");
    expect(html).toContain("&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;");
    expect(html).toContain("visibility sits at &lt;1&gt;");
  });
  it("fitReport(...).toMarkdown() has one table line per row with columns + 1 bare pipes", () => {
    const lines = report.toMarkdown().split("\n").filter((l) => l.startsWith("|"));
    expect(lines.length).toBe(2 + result.parameters.length + 10); // header + rule + parameters + section, 8 statistics rows and the goodness-of-fit row (hand count of fitTable)
    for (const l of lines) expect(l.replace(/\\\|/g, "").split("|").length - 1).toBe(3);
    expect(report.toMarkdown()).not.toMatch(/<script/);
  });
  it("fitReport(...).toString() aligns the value column", () => {
    const text = report.toString().split("\n");
    const valueStart = text[1].indexOf("Value");
    expect(text.find((l) => l.startsWith("separation d"))!.indexOf("(500.12")).toBe(valueStart);
  });
  it("fitReport(...).toMimeBundle() offers text/html, text/markdown and text/plain", () => {
    expect(Object.keys(report.toMimeBundle()).sort()).toEqual(["text/html", "text/markdown", "text/plain"]);
  });
  it.skipIf(!existsSync(PDFLATEX))("fitReport(...).toLatexDocument() compiles with pdflatex, hostile strings as text", () => {
    const { log, files } = compileLatex(report.toLatexDocument());
    expect(log).toMatch(/Output written on t\.pdf/);
    expect(log).not.toMatch(/runsystem|Undefined control sequence/);
    expect(files.sort()).toEqual(["t.aux", "t.log", "t.pdf", "t.tex"]);
  });
  it.skipIf(!existsSync(PDFLATEX))("fitReport(...).toLatex() is a tabular that compiles inside a bare document", () => {
    const body = report.toLatex();
    expect(body).toMatch(/^% Fit of model two-{}slit\n\\begin\{tabular\}\{ll\}/);
    const { log } = compileLatex(`\\documentclass{article}\n\\begin{document}\n${body}\n\\end{document}\n`);
    expect(log).toMatch(/Output written on t\.pdf/);
  });
  if (!existsSync(PDFLATEX)) console.warn("SKIPPED: LaTeX compile checks (Debian texlive-latex-base not installed)");
});

/** The ranking of stats' compareFits, as the table's rows. */
const rankFits = (fits: readonly LabelledFit[]) => comparisonRows(compareFits(fits.map((f) => ({ fit: f.result, label: f.label }))));

describe("comparisonReport(compareFits(fits), options)", () => {
  const a = makeFitResult();
  // ln L = −298.25 with k = 8 of n = 64: AIC = 596.5 + 16 = 612.5, BIC = 596.5 + 8 ln 64 (hand-checked).
  const b = makeFitResult({
    modelId: "two-slit-fresnel",
    statistics: { ...a.statistics, nFree: 8, dof: 56, logLikelihood: -298.25, aic: 612.5, aicc: 615.1, bic: 596.5 + 8 * Math.log(64) },
  });
  it("compareFits rows order by AIC with Akaike weights exp(-Δ/2)/Σ (Burnham & Anderson 2002, §2.9; hand-checked)", () => {
    const rows = rankFits([{ label: "far", result: a }, { label: "near", result: b }]);
    expect(rows.map((r) => r.label)).toEqual(["near", "far"]);
    expect(rows[1].deltaAic).toBeCloseTo(4.0, 12);
    // weights 1/(1+e^-2) = 0.880797 and e^-2/(1+e^-2) = 0.119203 (hand-checked)
    expect(rows[0].weight).toBeCloseTo(0.880797, 6);
    expect(rows[1].weight).toBeCloseTo(0.119203, 6);
    // ΔBIC = (602.5 + 7 ln 64) − (596.5 + 8 ln 64) = 6 − ln 64 (hand-checked)
    expect(rows[1].deltaBic).toBeCloseTo(6 - Math.log(64), 12);
  });
  it("compareFits gives a fit that did not converge weight 0 and the last place, as compareFits does", () => {
    // The unconverged fit has the lowest AIC; counting it would give it weight 0.88 (see above).
    const stuck = { ...b, converged: false, reason: "max-evaluations" as const };
    const rows = rankFits([{ label: "far", result: a }, { label: "near", result: stuck }]);
    expect(rows.map((r) => [r.label, r.converged, r.weight])).toEqual([["far", true, 1], ["near", false, 0]]);
    const verdict = compareFits([{ fit: a, label: "far" }, { fit: stuck, label: "near" }]);
    expect(verdict.rows[0].label).toBe(rows[0].label);
    expect(verdict.preferred).toBeNull(); // a comparison with a failed fit states no preference
    const table = comparisonTable(verdict);
    expect(table.rows.map((r) => ("cells" in r ? r.cells[0] : r.section))).toEqual(["far", "near (not converged)"]);
    const second = table.rows[1];
    expect("cells" in second ? second.cells[7] : undefined).toBe("0"); // weight column, after the goodness-of-fit column
  });
  it("compareFits refuses fits of different noise models", () => {
    const other = makeFitResult({ noise: "gaussian" });
    expect(() => rankFits([{ label: "a", result: a }, { label: "b", result: other }])).toThrow(/only compare fits with the same noise model/);
  });
  it("comparisonTable(list of fits) refuses: the report lays out a ranking, it does not rank", () => {
    const list = [{ label: "a", result: a }, { label: "b", result: b }] as unknown as Parameters<typeof comparisonTable>[0];
    expect(() => comparisonTable(list)).toThrow(/a compareFits\(\.\.\.\) result \(rank a list of fits with compareFits or compare first\)/);
  });
  it("comparisonTable(comparison, { fits }) shows each fit's goodness of fit", () => {
    const fits = [{ label: "far", result: a }, { label: "near", result: b }];
    const table = comparisonTable(compareFits(fits.map((f) => ({ fit: f.result, label: f.label }))), { fits });
    expect(table.rows.map((r) => ("cells" in r ? r.cells[1] : ""))).toEqual([b.goodness?.verdict, a.goodness?.verdict].map((v) => (v === "poor" ? "POOR" : v === "not-tested" ? "not tested" : v ?? "–")));
  });
  it("comparisonReport(...) renders, escapes labels and verdict, and compiles", () => {
    const r = comparisonReport(compareFits([{ label: HOSTILE[2], fit: a }, { label: "near <b>", fit: b }]), { verdict: HOSTILE[0] });
    expect(r.toHtml()).toContain("near &lt;b&gt;");
    expect(r.toHtml()).not.toContain("<script");
    expect(r.toMarkdown().split("\n").filter((l) => l.startsWith("|")).length).toBe(4); // header + rule + 2 fits
    if (existsSync(PDFLATEX)) expect(compileLatex(r.toLatexDocument()).log).toMatch(/Output written/);
  });
});

describe("quantityReport(quantities, options)", () => {
  const quantities = [
    { name: "fringeSpacing", value: 1.26543e-3, uncertainty: 2.345e-7, unit: "m", note: "λL/d" },
    { name: "fringeFrequency", value: 790.24, uncertainty: 0.146, unit: "m^-1" },
    { name: "degreeOfCoherence", value: 0.8731, uncertainty: Infinity, unit: "1", note: HOSTILE[0] },
  ];
  const r = quantityReport(quantities);
  it("formats each quantity with GUM rounding and readable units (m⁻¹)", () => {
    const text = r.toString();
    expect(text).toContain("(1.26543 ± 0.00023) mm"); // 1.26543e-3 ± 2.345e-7 m, hand-checked
    expect(text).toContain("(790.24 ± 0.15) m⁻¹");
    expect(text).toContain("0.8731 (uncertainty not estimated)");
    expect(r.toHtml()).not.toContain("<script");
  });
  it.skipIf(!existsSync(PDFLATEX))("compiles with pdflatex, units with superscripts", () => {
    expect(r.toLatex()).toContain("m\\textsuperscript{-}\\textonesuperior{}");
    expect(compileLatex(r.toLatexDocument()).log).toMatch(/Output written/);
  });
});

describe("fitTable(result, {showInactive})", () => {
  const base = makeFitResult();
  const withOff = {
    ...base,
    parameters: [...base.parameters, { name: "blur", unit: "m", value: 0, uncertainty: 0, fixed: true, tied: null, atBound: null, lower: 0, upper: Infinity }],
  };
  it("leaves effects fixed at 0 out of the rows and names them in a note", () => {
    const text = fitReport(withOff).toString();
    expect(text).not.toMatch(/^blur/m);
    expect(text).toContain("Not included (fixed at 0): blur σ_b.");
  });
  it("shows them as rows with showInactive: true", () => {
    expect(fitReport(withOff, { showInactive: true }).toString()).toMatch(/^blur σ_b +0 m \(fixed\)/m);
  });
});

describe("testNote(test)", () => {
  it("testNote prints statistics to 2 decimals and p-values to 2 significant digits (hand-made test result)", () => {
    const note = testNote({
      simpler: "two-slit", larger: "two-slit-broadband", extraParameters: 1, likelihoodRatio: 16.6, likelihoodRatioPValue: 4.6e-5,
      f: 2.4, fPValue: 0.1234, fDof: [1, 900], nesting: "model", boundaryCorrected: true,
    });
    expect(note).toBe(
      "two-slit within two-slit-broadband (1 extra parameter): likelihood ratio 16.60, p = 4.6e-5; F(1, 900) = 2.40, p = 0.12 (likelihood-ratio p halved: the simpler model sits on a bound).",
    );
  });
});
