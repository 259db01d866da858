// Node-side files: loadProfile(path), saveResults(fit, path) atomic with folders created, loadResults(path).
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadProfile, loadResults, saveResults } from "../../kernel-ext/files/index.js";
import { fitProfile, readProfile, replayResults } from "../../src/index.js";
import { sha256Hex } from "../../src/advanced.js";

const csv = new URL("../../notebooks-demo/data/line-pair-A.csv", import.meta.url);
const work = mkdtempSync(path.join(tmpdir(), "fringekit-files-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe("loadProfile(path, options) / saveResults(fit, path) / loadResults(path)", () => {
  it("loadProfile(path) equals readProfile(bytes) with the file's base name as source", async () => {
    const { profile } = await loadProfile(csv.pathname);
    const bytes = readFileSync(csv);
    expect(profile.provenance?.source).toBe("line-pair-A.csv");
    expect(profile.provenance?.sha256).toBe(sha256Hex(bytes)); // SHA-256 of the bytes (FIPS 180-4)
    expect(profile.y).toEqual(readProfile(bytes, { source: "line-pair-A.csv" }).profile.y);
  });

  it("saveResults(fit, \"a/b/fit.json\") creates the folders, leaves no temporary file, and replays", async () => {
    const { profile } = await loadProfile(csv.pathname);
    const fit = fitProfile(profile, "two-slit", { fix: { wavelength: 680e-9, distance: 0.75, pixelWidth: 5.5e-6 } });
    const target = path.join(work, "a", "b", "fit.json");
    await saveResults(fit, target, { notes: ["demo"] });
    expect(readdirSync(path.dirname(target))).toEqual(["fit.json"]);
    const doc = await loadResults(target);
    expect(doc.notes).toEqual(["demo"]);
    expect(replayResults(doc, profile).reproduced).toBe(true);
  });

  it("saveResults(notAFit, path) is refused with what to give", async () => {
    await expect(saveResults({} as never, path.join(work, "x.json"))).rejects.toThrow(/a fit from fitProfile or a comparison/);
  });
});
