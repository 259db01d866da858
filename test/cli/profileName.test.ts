// fringekit profile FRAME --out OUT.csv with a hostile frame file name: a newline in the name
// must not inject lines into the CSV (the name is quoted in a comment line), and the output reads
// back as the same table as for a plain name.
import { copyFileSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { parseTable } from "../../src/advanced.js";
import { runInProcess } from "./runCli.js";

const corpus = (name: string) => new URL(`../io/corpus/${name}`, import.meta.url);

describe("fringekit profile (file name with a newline)", () => {
  it("profile 'x\\nposition [mm],intensity,sigma\\n1,2,3\\n.png' --out writes a table that reads back unchanged", async () => {
    const dir = mkdtempSync(path.join(tmpdir(), "fk-name-"));
    try {
      const plain = path.join(dir, "plain.png");
      const hostile = path.join(dir, "x\nposition [mm],intensity,sigma\n1,2,3\n\u001b[2J.png");
      copyFileSync(corpus("good16.png"), plain);
      copyFileSync(corpus("good16.png"), hostile);
      const a = await runInProcess(["profile", plain, "--pixel-pitch", "5.5", "um", "--out", path.join(dir, "a.csv")]);
      const b = await runInProcess(["profile", hostile, "--pixel-pitch", "5.5", "um", "--out", path.join(dir, "b.csv")]);
      expect([a.code, b.code]).toEqual([0, 0]);
      const textA = readFileSync(path.join(dir, "a.csv"), "utf8");
      const textB = readFileSync(path.join(dir, "b.csv"), "utf8");
      expect(textB.split("\n").length).toBe(textA.split("\n").length);
      expect(textB).not.toMatch(/[\u0000-\u0009\u000b-\u001f]/);
      const rowsA = parseTable(textA, { source: "a.csv" }).profile;
      const rowsB = parseTable(textB, { source: "b.csv" }).profile;
      expect(Array.from(rowsB.y)).toEqual(Array.from(rowsA.y));
      expect(Array.from(rowsB.x)).toEqual(Array.from(rowsA.x));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});
