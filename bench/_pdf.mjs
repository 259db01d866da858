import zlib from "node:zlib";
const orig = zlib.deflateSync;
const { readFileSync } = await import("node:fs");
const { fitFigure } = await import("fringekit/figures");
const { figureScene } = await import("../dist/src/report/render/figureScene.js");
const { sceneToPdf } = await import("../dist/kernel-ext/figures/pdfScene.js");
const rows = readFileSync("/tmp/b7/b1-fit.csv", "utf8").trim().split("\n").slice(1).map((line) => line.split(",").map(Number));
const column = (k) => Float64Array.from(rows, (r) => r[k]);
const figure = fitFigure({ x: column(0), y: column(1), yUnit: "counts", counts: true }, { modelId: "two-slit", model: column(2), residuals: column(3) });
const scene = figureScene(figure);
let sizes = [];
const calls = [];
// measure the data passed to deflateSync by sceneToPdf
const mod = await import("node:zlib");
const t0 = performance.now(); const pdf = sceneToPdf(scene); const t1 = performance.now();
console.log("cold pdf", (t1 - t0).toFixed(1), "ms", pdf.length);
for (let k = 0; k < 3; k++) { const a = performance.now(); sceneToPdf(scene); console.log("warm pdf", (performance.now() - a).toFixed(1)); }
