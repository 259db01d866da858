import zlib from "node:zlib";
import { createRequire } from "node:module";
const { readFileSync } = await import("node:fs");
const { fitFigure } = await import("fringekit/figures");
const { figureScene } = await import("../dist/src/report/render/figureScene.js");
const { pathOperators } = await import("../dist/kernel-ext/figures/pdfScene.js");
const rows = readFileSync("/tmp/b7/b1-fit.csv", "utf8").trim().split("\n").slice(1).map((line) => line.split(",").map(Number));
const column = (k) => Float64Array.from(rows, (r) => r[k]);
const scene = figureScene(fitFigure({ x: column(0), y: column(1), yUnit: "counts", counts: true }, { modelId: "two-slit", model: column(2), residuals: column(3) }));
const ds = []; const walk = (items) => items.forEach((it) => it.type === "group" ? walk(it.items) : it.type === "path" && ds.push(it.d)); walk(scene.items);
const content = Buffer.from(ds.map(pathOperators).join("\n"), "latin1");
console.log("content", (content.length / 1024).toFixed(0), "KB");
for (const level of [6, 3, 1]) {
  const c0 = process.cpuUsage(); let z; for (let k = 0; k < 20; k++) z = zlib.deflateSync(content, { level }); const c = process.cpuUsage(c0);
  console.log("level", level, ((c.user + c.system) / 20 / 1000).toFixed(1), "ms cpu", (z.length / 1024).toFixed(0), "KB");
}
