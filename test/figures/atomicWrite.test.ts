// writeFileAtomic over special files: regular files and missing paths are replaced atomically,
// FIFOs and character devices are streamed to (never replaced by a regular file), other kinds
// are refused, and the temporary file is created exclusively (a symlink planted at its name is
// never followed). Expected behaviour: POSIX open(2) O_EXCL semantics and `mkfifo`/`mknod`
// file types (open standard, POSIX.1-2017).
import { execFileSync, spawn } from "node:child_process";
import { lstatSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync, symlinkSync, writeFileSync, mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";

const fixedBytes = { value: undefined as Buffer | undefined };
vi.mock("node:crypto", async (importOriginal) => {
  const real = await importOriginal<typeof import("node:crypto")>();
  return { ...real, default: real, randomBytes: (n: number) => fixedBytes.value?.subarray(0, n) ?? real.randomBytes(n) };
});

const { writeFileAtomic, writeFileAtomicSync, temporaryPathFor } = await import("../../kernel-ext/figures/atomicWrite.js");

const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
let dir: string;
beforeEach(() => { dir = mkdtempSync(path.join(tmpdir(), "fk-atomic-")); fixedBytes.value = undefined; });
afterEach(() => { rmSync(dir, { recursive: true, force: true }); });

const readers: ReturnType<typeof spawn>[] = [];
afterEach(() => { for (const child of readers.splice(0)) child.kill(); });

/** Starts `cat fifo` (killed after the test, so a writer that never opens the FIFO cannot hang it) and resolves with what it read. */
function readFifo(fifo: string): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn("cat", [fifo]);
    readers.push(child);
    let out = "";
    child.stdout.on("data", (chunk) => { out += chunk; });
    child.on("error", reject);
    child.on("close", () => resolve(out));
  });
}

describe("writeFileAtomic(target, bytes)", () => {
  it("writeFileAtomic(missing path) creates the file and leaves no temporary file", async () => {
    const target = path.join(dir, "out.txt");
    await writeFileAtomic(target, "hello");
    expect(readFileSync(target, "utf8")).toBe("hello");
    expect(readdirSync(dir)).toEqual(["out.txt"]);
  });

  it("writeFileAtomic(regular file) replaces it and keeps its permission bits", async () => {
    const target = path.join(dir, "out.txt");
    writeFileSync(target, "old", { mode: 0o640 });
    await writeFileAtomic(target, "new");
    expect(readFileSync(target, "utf8")).toBe("new");
    expect(statSync(target).mode & 0o777).toBe(0o640);
  });

  it("writeFileAtomic(FIFO) streams into the FIFO, which stays a FIFO", async () => {
    const fifo = path.join(dir, "pipe");
    execFileSync("mkfifo", [fifo]);
    const reading = readFifo(fifo);
    await writeFileAtomic(fifo, "through the pipe");
    if (!lstatSync(fifo).isFIFO()) readers[0]?.kill(); // replaced: the reader would wait forever
    expect(await reading).toBe("through the pipe");
    expect(lstatSync(fifo).isFIFO()).toBe(true);
  });

  it.skipIf(!isRoot)("writeFileAtomic(character device) writes to the device, which stays a device (root only: mknod)", async () => {
    const device = path.join(dir, "null");
    execFileSync("mknod", [device, "c", "1", "3"]); // the null device's numbers (Linux devices.txt)
    await writeFileAtomic(device, "x".repeat(2048));
    expect(lstatSync(device).isCharacterDevice()).toBe(true);
    writeFileAtomicSync(device, "y");
    expect(lstatSync(device).isCharacterDevice()).toBe(true);
  });

  it("writeFileAtomic(symlink to a regular file) writes the file the link names and keeps the link", async () => {
    const real = path.join(dir, "real.txt");
    writeFileSync(real, "old");
    const link = path.join(dir, "link.txt");
    symlinkSync(real, link);
    await writeFileAtomic(link, "new");
    expect(lstatSync(link).isSymbolicLink()).toBe(true);
    expect(readFileSync(real, "utf8")).toBe("new");
  });

  it("writeFileAtomic(directory) is refused with a message naming the path", async () => {
    const sub = path.join(dir, "sub");
    mkdirSync(sub);
    await expect(writeFileAtomic(sub, "x")).rejects.toThrow(/sub.*is a folder/);
  });

  it("writeFileAtomic(target) never follows a symlink planted at the temporary name", async () => {
    fixedBytes.value = Buffer.alloc(32, 7); // the attacker "knows" the random part
    const target = path.join(dir, "out.txt");
    const victim = path.join(dir, "victim.txt");
    writeFileSync(victim, "precious");
    symlinkSync(victim, temporaryPathFor(target));
    await expect(writeFileAtomic(target, "evil")).rejects.toThrow();
    expect(readFileSync(victim, "utf8")).toBe("precious");
    expect(() => writeFileAtomicSync(target, "evil")).toThrow();
    expect(readFileSync(victim, "utf8")).toBe("precious");
  });

  it("temporaryPathFor(target) is in the target's folder and unpredictable (two calls differ)", () => {
    const target = path.join(dir, "out.txt");
    const a = temporaryPathFor(target);
    const b = temporaryPathFor(target);
    expect(path.dirname(a)).toBe(dir);
    expect(a).not.toBe(b);
    expect(path.basename(a).length).toBeGreaterThan("out.txt".length + 16);
  });
});

describe("fringekit fit line.csv --out SPECIAL", () => {
  it("fit --out FIFO streams the summary and leaves the FIFO in place", async () => {
    const { runInProcess } = await import("../cli/runCli.js");
    const fifo = path.join(dir, "pipe");
    execFileSync("mkfifo", [fifo]);
    const reading = readFifo(fifo);
    const csv = path.join(dir, "line.csv");
    writeFileSync(csv, "position (mm),intensity\n" + Array.from({ length: 60 }, (_, i) => `${(i * 0.02 - 0.6).toFixed(3)},${(100 + 80 * Math.cos(2 * Math.PI * (i * 0.02 - 0.6) / 0.15)).toFixed(2)}`).join("\n") + "\n");
    const result = await runInProcess(["fit", csv, "--out", fifo]);
    if (!lstatSync(fifo).isFIFO()) readers[0]?.kill();
    const written = await reading;
    expect(lstatSync(fifo).isFIFO()).toBe(true);
    expect(result.code === 0 ? written.length > 0 : written === "").toBe(true);
  }, 60_000);
});
