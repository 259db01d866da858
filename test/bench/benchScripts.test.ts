/**
 * The benchmark scripts still load and run: a bench that fails to import (an export renamed or
 * moved between entry points) is caught here, on tiny inputs, without timing anything.
 */
import { figureFontsInstalled } from "../figures/fontsInstalled.js";
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
const BENCH = path.join(ROOT, "bench");

describe("bench/", () => {
  for (const file of readdirSync(BENCH).filter((f) => /^B\d+\.ts$/.test(f))) {
    it(`import("bench/${file}") loads and exports main()`, async () => {
      const module = await import(path.join(BENCH, file));
      expect(typeof module.main).toBe("function");
    });
  }
});

const haveFonts = figureFontsInstalled("bench/figureExport.mjs smoke test");

describe.skipIf(!haveFonts)("bench/figureExport.mjs (B7's fringekit side)", () => {
  const work = mkdtempSync(path.join(tmpdir(), "fringekit-b7-smoke-"));
  afterAll(() => rmSync(work, { recursive: true, force: true }));

  it("node bench/figureExport.mjs DATA.csv OUT writes the fit figure as SVG, PDF and 600 dpi PNG", () => {
    if (!existsSync(path.join(ROOT, "dist/kernel-ext/figures/index.js"))) throw new Error("bench/figureExport.mjs runs on the built package: run `npm run build` first");
    // 64 points of a cos² fringe pattern (x in m, counts), its "model" and residuals.
    const lines = ["x,y,model,residual"];
    for (let i = 0; i < 64; i++) {
      const x = (i - 32) * 5.5e-6;
      const model = 100 + 900 * Math.cos((Math.PI * x) / 40e-6) ** 2;
      const y = model + ((i % 5) - 2) * 3;
      lines.push(`${x},${y},${model},${(y - model) / Math.sqrt(model)}`);
    }
    const data = path.join(work, "tiny.csv");
    writeFileSync(data, `${lines.join("\n")}\n`);
    const base = path.join(work, "out", "fig");
    const run = spawnSync(process.execPath, [path.join(BENCH, "figureExport.mjs"), data, base], { cwd: ROOT, encoding: "utf8", timeout: 60_000 });
    expect(run.stderr).toBe("");
    expect(run.status).toBe(0);
    const svg = readFileSync(`${base}.svg`, "utf8");
    expect(svg.startsWith("<svg")).toBe(true);
    expect(svg).toContain("two-slit fit");
    const pdf = readFileSync(`${base}.pdf`);
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(pdf.subarray(-6).toString("latin1")).toBe("%%EOF\n");
    const png = readFileSync(`${base}.png`);
    // PNG signature and IHDR width (ISO/IEC 15948:2003 §5.2, §11.2.2): 85 mm at 600 dpi = 2008 px.
    expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    expect(png.readUInt32BE(16)).toBe(Math.round((85 / 25.4) * 600));
  });
});
