// SnapshotSourceFiles (kernel-ext/startSnapshot.ts): a snapshot's parsed declaration file is
// given to the type-checker only while the file on disk is the one parsed (size and modification
// time, as fs.stat reports them), under the same parse options and TypeScript; and the builds it
// asks for. The built module is used because the snapshot's key names the built entry script.
import { mkdirSync, mkdtempSync, rmSync, statSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { parseOptionsOf, SnapshotSourceFiles, type KernelSnapshot } from "../../dist/kernel-ext/startSnapshot.js";

const typescriptPath = createRequire(import.meta.url).resolve("@tslab/typescript-for-tslab", { paths: [path.dirname(createRequire(import.meta.url).resolve("tslab/package.json"))] });
const OPTIONS = { target: 9, module: 99, moduleResolution: 100, rootDir: "/somewhere" };

let dir = "";
let lib = "";
let pkg = "";
beforeEach(() => {
  dir = mkdtempSync(path.join(tmpdir(), "fringekit-sourcefiles-"));
  lib = path.join(dir, "lib.d.ts");
  pkg = path.join(dir, "node_modules", "pkg", "index.d.ts");
  writeFileSync(lib, "declare const answer: number;\n");
  mkdirSync(path.dirname(pkg), { recursive: true });
  writeFileSync(pkg, "export declare const pkg: string;\n");
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

const parsed = { languageVersion: 9, impliedNodeFormat: undefined, version: "1" };
function snapshotOf(file: string): KernelSnapshot {
  const stat = statSync(file);
  return { format: 1, key: "k", typescriptPath, typescript: {}, parseOptions: parseOptionsOf(OPTIONS), files: new Map([[file, { fileName: file, size: stat.size, mtimeMs: stat.mtimeMs, sourceFile: parsed }]]) };
}
function started(snapshot: KernelSnapshot | undefined, options: Record<string, unknown> = OPTIONS, fromSnapshot = true): SnapshotSourceFiles {
  const files = new SnapshotSourceFiles(snapshot);
  files.typescriptLoaded(fromSnapshot);
  files.compilerOptions(options);
  return files;
}
const program = (...names: string[]) => ({ getSourceFiles: () => names.map((fileName) => ({ fileName, isDeclarationFile: fileName.endsWith(".d.ts") })) });

describe("SnapshotSourceFiles", () => {
  it("get(file, options) gives the parsed file while the file is unchanged, under other path options too", () => {
    expect(started(snapshotOf(lib), { ...OPTIONS, rootDir: "/elsewhere" }).get(lib, { languageVersion: 9, impliedNodeFormat: undefined })).toBe(parsed);
    expect(started(snapshotOf(lib)).get(lib, 9)).toBe(parsed);
  });

  it("get(file, options) after the file changed size is undefined (parsed as usual)", () => {
    const snapshot = snapshotOf(lib);
    writeFileSync(lib, "declare const answer: string;\n// changed\n");
    expect(started(snapshot).get(lib, 9)).toBeUndefined();
  });

  it("get(file, options) after the file was rewritten with a new modification time is undefined", () => {
    const snapshot = snapshotOf(lib);
    const entry = snapshot.files.get(lib)!;
    snapshot.files.set(lib, { ...entry, mtimeMs: entry.mtimeMs - 1000 });
    expect(started(snapshot).get(lib, 9)).toBeUndefined();
  });

  it("get() is undefined for another language version, other parse options, or another TypeScript", () => {
    expect(started(snapshotOf(lib)).get(lib, 7)).toBeUndefined();
    expect(started(snapshotOf(lib), { ...OPTIONS, jsx: 2 }).get(lib, 9)).toBeUndefined();
    expect(started(snapshotOf(lib), OPTIONS, false).get(lib, 9)).toBeUndefined();
    expect(started(snapshotOf(lib)).get(pkg, 9)).toBeUndefined();
  });

  it("needsBuild() without a snapshot, and buildJob() lists the declaration files on disk", () => {
    const files = started(undefined);
    files.programCreated(program(lib, path.join(dir, "__prev__.d.ts"), path.join(dir, "cell.ts")), typescriptPath, dir);
    expect(files.needsBuild()).toBe(true);
    const job = files.buildJob()!;
    expect(job.files.map((f) => f.fileName)).toEqual([lib]);
    expect(path.dirname(job.blob)).toBe(dir);
    expect(job.parseOptions).toBe(parseOptionsOf(OPTIONS));
  });

  it("needsBuild() with a snapshot that served the first program: only for imported packages it lacks, once per new file", () => {
    const files = started(snapshotOf(lib));
    files.get(lib, 9);
    files.programCreated(program(lib), typescriptPath, dir);
    expect(files.needsBuild()).toBe(false);
    files.programCreated(program(lib, path.join(dir, "local.d.ts")), typescriptPath, dir);
    expect(files.needsBuild()).toBe(false); // the notebook's own files: not worth a build
    files.programCreated(program(lib, pkg), typescriptPath, dir);
    expect(files.needsBuild()).toBe(true);
    expect(files.buildJob()!.files.map((f) => f.fileName).sort()).toEqual([lib, pkg].sort());
    expect(files.needsBuild()).toBe(false); // handed out already
  });

  it("needsBuild() when the snapshot missed a file of the first program", () => {
    const files = started(snapshotOf(lib));
    writeFileSync(lib, "declare const answer: boolean; // changed\n");
    expect(files.get(lib, 9)).toBeUndefined();
    files.programCreated(program(lib), typescriptPath, dir);
    expect(files.needsBuild()).toBe(true);
  });
});
