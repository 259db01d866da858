// The committed demo data are exactly what the committed generator writes (seeded, so byte for
// byte), and every notebook names the fringekit kernel and opens with the laser-safety caution.
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";

const root = path.join(path.dirname(fileURLToPath(import.meta.url)), "..", "..");
const committed = path.join(root, "notebooks-demo", "data");
const scratch = mkdtempSync(path.join(tmpdir(), "fringekit-demo-data-"));
afterAll(() => rmSync(scratch, { recursive: true, force: true }));

/** Relative paths of every file under `folder`, sorted. */
function filesUnder(folder: string, prefix = ""): string[] {
  return readdirSync(folder).flatMap((name) => {
    const full = path.join(folder, name);
    return statSync(full).isDirectory() ? filesUnder(full, `${prefix}${name}/`) : [`${prefix}${name}`];
  }).sort();
}

describe("scripts/make-demo-data.ts", () => {
  it("make-demo-data.ts FOLDER rewrites the committed data byte for byte", () => {
    const tsx = path.join(root, "node_modules", "tsx", "dist", "cli.mjs");
    const result = spawnSync(process.execPath, [tsx, path.join(root, "scripts", "make-demo-data.ts"), scratch], { cwd: root, encoding: "utf8" });
    expect(result.status, result.stderr).toBe(0);
    const written = filesUnder(scratch);
    expect(written).toEqual(filesUnder(committed).filter((name) => name !== "README.md"));
    for (const name of written) {
      expect(readFileSync(path.join(scratch, name)).equals(readFileSync(path.join(committed, name))), `${name} differs from the generator's output`).toBe(true);
    }
  }, 120_000);

  it("truths.json holds the truths the data README states", () => {
    const truths = JSON.parse(readFileSync(path.join(committed, "truths.json"), "utf8"));
    const readme = readFileSync(path.join(committed, "README.md"), "utf8");
    expect(readme).toMatch(/simulated/i);
    // README values in mm / nm / counts against truths.json in SI.
    expect(readme).toContain(`separation ${(truths.lineA.separation * 1e3).toFixed(3)} mm`);
    expect(readme).toContain(`bandwidth ${(truths.lineA.bandwidth * 1e9).toFixed(0)} nm`);
    expect(readme).toContain(`pinhole diameter ${(truths.coherenceScan.diameter * 1e3).toFixed(3)} mm`);
    expect(readme).toContain(`≈ ${truths.nearField.fresnelNumber.toFixed(2)}`);
  });
});

describe("notebooks-demo/*.ipynb", () => {
  const notebooks = readdirSync(path.join(root, "notebooks-demo")).filter((name) => name.endsWith(".ipynb"));
  it("each notebook uses the fringekit kernel and package imports, opens with the laser-safety caution and ends with checks", () => {
    expect(notebooks.length).toBeGreaterThanOrEqual(3);
    for (const name of notebooks) {
      const notebook = JSON.parse(readFileSync(path.join(root, "notebooks-demo", name), "utf8"));
      expect(notebook.nbformat, name).toBe(4);
      expect(notebook.metadata.kernelspec.name, name).toBe("fringekit");
      const text = (cell: { source: string | string[] }) => (Array.isArray(cell.source) ? cell.source.join("") : cell.source);
      const opening = text(notebook.cells[0]).replace(/\s*\n>\s*/g, " "); // join the quote block lines
      expect(opening, name).toMatch(/Laser safety/);
      expect(opening, name).toMatch(/laser safety officer/);
      expect(opening, name).toMatch(/does not make a measurement safe/);
      const last = notebook.cells[notebook.cells.length - 1];
      expect(last.cell_type, name).toBe("code");
      expect(text(last), name).toMatch(/throw new Error/);
      // Cells use the package's entry points (fringekit, fringekit/figures, fringekit/widgets), as a user's would.
      for (const cell of notebook.cells) {
        if (cell.cell_type === "code") expect(text(cell), name).not.toMatch(/from\s+["']\.\.?\//);
      }
      // Committed without outputs: the executed copies live in out/notebooks/.
      for (const cell of notebook.cells) if (cell.cell_type === "code") expect(cell.outputs, name).toEqual([]);
    }
  });
});
