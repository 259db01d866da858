// B7's fringekit side, run as a fresh process: the paper fit figure of a fitted profile written
// as SVG, PDF and 600 dpi PNG with saveFigure, as a script that only makes figures would
// (everything from fringekit/figures: the builder and the writer).
// Usage: node bench/figureExport.mjs DATA.csv OUT_BASE   (DATA.csv: x (m), y, model, residual)
import { readFileSync } from "node:fs";
import { fitFigure, saveFigure } from "fringekit/figures";

const [dataFile, base] = process.argv.slice(2);
if (!dataFile || !base) throw new Error("usage: node bench/figureExport.mjs DATA.csv OUT_BASE");
const rows = readFileSync(dataFile, "utf8").trim().split("\n").slice(1).map((line) => line.split(",").map(Number));
const column = (k) => Float64Array.from(rows, (r) => r[k]);
const profile = { x: column(0), y: column(1), yUnit: "counts", counts: true };
const figure = fitFigure(profile, { modelId: "two-slit", model: column(2), residuals: column(3) });
await saveFigure(figure, base, { formats: ["svg", "pdf", "png"], dpi: 600 });
