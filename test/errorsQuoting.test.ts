// Error messages quote file content safely: control characters (C0, DEL, C1 — ECMA-48 terminal
// escape sequences start with ESC or CSI) are shown as \xNN escapes, never sent raw to a terminal,
// and quoted text is capped so a "one-line" error stays short.
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { DataError, InvalidArgumentError } from "../src/errors.js";
import { runInProcess } from "./cli/runCli.js";

const CONTROL = /[\u0000-\u001f\u007f-\u009f]/;

describe("error messages with hostile text", () => {
  it("DataError(source with ESC, problem with OSC/BEL and CSI) has no control character", () => {
    const error = new DataError("scan\u001b[31m.csv", 'a non-numeric cell "\u001b]0;pwned\u0007\u009b2J"', "fix it", 3);
    expect(error.message).not.toMatch(CONTROL);
    expect(error.message).toContain("\\x1b");
    expect(error.message).toContain("\\x9b");
  });

  it("InvalidArgumentError(unit, a 3 MB string) quotes at most a few hundred characters", () => {
    const error = new InvalidArgumentError("unit", "m".repeat(3_000_000), "a length unit");
    expect(error.message.length).toBeLessThan(300);
    expect(error.message).toMatch(/3000000 characters/);
  });

  it("DataError(problem quoting a 3 MB text) stays short", () => {
    const error = new DataError("a.csv", `the unit "${"x".repeat(3_000_000)}" is not a length`, "use m");
    expect(error.message.length).toBeLessThan(1000);
  });

  it("fringekit fit (a cell with terminal escapes) prints one line without control characters", async () => {
    const dir = mkdtempSync(path.join(tmpdir(), "fk-quote-"));
    try {
      const file = path.join(dir, "esc.csv");
      writeFileSync(file, `position (mm),intensity\n${Array.from({ length: 10 }, (_, i) => `${i},${i + 1}`).join("\n")}\n11,\u001b]0;owned\u0007\u001b[2J\n`);
      const { code, stderr } = await runInProcess(["fit", file]);
      expect(code).toBe(2);
      expect(stderr.trimEnd()).not.toMatch(CONTROL);
      expect(stderr.trimEnd().split("\n")).toHaveLength(1);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});
