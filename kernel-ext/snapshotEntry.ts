/**
 * The body of the start-up snapshot's entry script (Node's "Startup snapshot" API): buildSnapshot.ts
 * writes `(SOURCE)(require, JOB_FILE)` with this function's source into a script and runs
 * `node --snapshot-blob FILE --build-snapshot SCRIPT`. It loads TypeScript for tslab, parses and
 * binds the job's declaration files as the kernel's type-checker would, and leaves them on the
 * global SNAPSHOT_GLOBAL of startSnapshot.ts, from where a kernel started from the snapshot takes
 * them.
 *
 * An entry script is a CommonJS script whose `require` loads only Node's built-in modules, so
 * the function uses nothing from outside itself: TypeScript is loaded as Node's CommonJS loader
 * would (Module.wrap); the job's shape is startSnapshot.ts's SnapshotJob.
 * @param require the entry script's require (built-in modules only)
 * @param jobFile path of the SnapshotJob JSON file
 */
export function buildKernelSnapshot(require: NodeJS.Require, jobFile: string): void {
  const fs = require("node:fs") as typeof import("node:fs");
  const path = require("node:path") as typeof import("node:path");
  const vm = require("node:vm") as typeof import("node:vm");
  const { Module } = require("node:module") as typeof import("node:module");

  interface Job {
    format: number;
    key: string;
    typescriptPath: string;
    parseOptions: string;
    files: { fileName: string }[];
  }
  const job = JSON.parse(fs.readFileSync(jobFile, "utf8")) as Job;

  // TypeScript's own require gets only built-in modules, which is all it asks for when loading.
  const source = fs.readFileSync(job.typescriptPath, "utf8");
  const module = { exports: {} as Record<string, unknown>, id: job.typescriptPath, filename: job.typescriptPath, loaded: false };
  const wrapper = vm.runInThisContext(Module.wrap(source), { filename: job.typescriptPath }) as (...args: unknown[]) => void;
  wrapper.call(module.exports, module.exports, require, module, job.typescriptPath, path.dirname(job.typescriptPath));
  module.loaded = true;
  const ts = module.exports as {
    createSourceFile(fileName: string, text: string, options: unknown, setParentNodes?: boolean): { version?: string };
    bindSourceFile(file: unknown, options: unknown): void;
    getEmitScriptTarget(options: unknown): number;
    getSetExternalModuleIndicator(options: unknown): unknown;
    createProgram(rootNames: string[], options: unknown, host: unknown): { getSemanticDiagnostics(): unknown; getDeclarationDiagnostics(): unknown; emit(): unknown };
  };
  // Nothing here may call TypeScript's `sys`: it memoizes the working directory at its first
  // call, and what the snapshot memoizes, every kernel started from it would keep.

  /** The text as TypeScript's sys.readFile gives it (a UTF-8 byte-order mark dropped); undefined for UTF-16. */
  const readText = (fileName: string): string | undefined => {
    const bytes = fs.readFileSync(fileName);
    if (bytes.length >= 2 && ((bytes[0] === 0xfe && bytes[1] === 0xff) || (bytes[0] === 0xff && bytes[1] === 0xfe))) return undefined;
    const bom = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
    return bytes.toString("utf8", bom ? 3 : 0);
  };
  /** A version token for the builder (FNV-1a of the text, with its length). */
  const versionOf = (text: string): string => {
    let hash = 0x811c9dc5;
    for (let i = 0; i < text.length; i++) hash = Math.imul(hash ^ text.charCodeAt(i), 0x01000193) >>> 0;
    return `${text.length}-${hash.toString(16)}`;
  };

  const options = JSON.parse(job.parseOptions) as Record<string, unknown>;
  // What the type-checker's program passes for a declaration file (module format: none under
  // "bundler" resolution).
  const parse = { languageVersion: ts.getEmitScriptTarget(options), impliedNodeFormat: undefined, setExternalModuleIndicator: ts.getSetExternalModuleIndicator(options) };
  const texts = new Map<string, string>();
  const files = new Map<string, { fileName: string; size: number; mtimeMs: number; sourceFile: unknown }>();
  for (const { fileName } of job.files) {
    let before: import("node:fs").Stats, after: import("node:fs").Stats, text: string | undefined;
    try {
      before = fs.statSync(fileName);
      text = readText(fileName);
      after = fs.statSync(fileName);
    } catch {
      continue; // gone since the kernel listed it: parsed as usual at start
    }
    if (text === undefined || before.size !== after.size || before.mtimeMs !== after.mtimeMs) continue;
    const sourceFile = ts.createSourceFile(fileName, text, parse, false);
    // The type-checker's builder needs a version per file (the watch program hashes the text).
    sourceFile.version = versionOf(text);
    ts.bindSourceFile(sourceFile, options);
    texts.set(fileName, text);
    files.set(fileName, { fileName, size: after.size, mtimeMs: after.mtimeMs, sourceFile });
  }

  // Warm-up: V8 keeps the bytecode of functions that ran while the snapshot was built, so a
  // kernel's first cells do not compile the parser, binder, checker and emitter anew. It runs
  // on fresh copies of the declarations and a made-up cell in a program of its own (a host that
  // reads only these texts), so the stored SourceFiles stay as parsed and bound above.
  const warm = "/fringekit-snapshot-warm-up";
  const cell = [
    'import * as fs from "fs";',
    'import { scale, type Unit } from "warm-up-package";',
    'import { count } from "./helper.js";',
    "interface Row { x: number; label?: string }",
    "const rows: Row[] = [1, 2, 3].map((x) => ({ x: scale(x, \"mm\" as Unit) }));",
    "export const total = rows.reduce((sum, row) => sum + row.x, count(\"abc\"));",
    "export class Box<T> { constructor(public value: T) {} get(): T { return this.value; } }",
    'export const text = new Box<string>("a").get().toUpperCase() + String(fs.existsSync);',
    "export async function later(ms: number): Promise<number> { await new Promise((r) => setTimeout(r, ms)); return Buffer.from([1]).length; }",
  ].join("\n");
  // A package resolved through package.json "exports", a local module, and a type error.
  const sources = new Map<string, string>([
    ...texts,
    [`${warm}/cell.ts`, cell],
    [`${warm}/helper.ts`, "export const count = (text: string): number => text.length;\n"],
    [`${warm}/wrong.ts`, 'export const wrong: number = "text";\nexport const missing = rows;\n'],
    [`${warm}/node_modules/warm-up-package/package.json`, JSON.stringify({ name: "warm-up-package", type: "module", exports: { ".": { types: "./index.d.ts", default: "./index.js" } } })],
    [`${warm}/node_modules/warm-up-package/index.d.ts`, 'export type Unit = "m" | "mm";\nexport declare function scale(x: number, unit: Unit): number;\n'],
  ]);
  const roots = [...texts.keys(), `${warm}/cell.ts`, `${warm}/wrong.ts`];
  const libDir = path.dirname(job.typescriptPath);
  const warmOptions = { ...options, noLib: true, types: [], declaration: true, skipLibCheck: true, outDir: `${warm}/out` };
  const host = {
    getSourceFile: (fileName: string, languageVersion: unknown) => {
      const text = sources.get(fileName);
      return text === undefined ? undefined : ts.createSourceFile(fileName, text, languageVersion, false);
    },
    getDefaultLibFileName: () => path.join(libDir, "lib.d.ts"),
    getDefaultLibLocation: () => libDir,
    writeFile: () => undefined,
    getCurrentDirectory: () => warm,
    getCanonicalFileName: (fileName: string) => fileName,
    useCaseSensitiveFileNames: () => true,
    getNewLine: () => "\n",
    fileExists: (fileName: string) => sources.has(fileName),
    readFile: (fileName: string) => sources.get(fileName),
    directoryExists: (dir: string) => [...sources.keys()].some((name) => name.startsWith(`${dir}/`)),
    getDirectories: () => [],
    realpath: (fileName: string) => fileName,
  };
  try {
    for (let round = 0; round < 2; round++) {
      const program = ts.createProgram(roots, warmOptions, host);
      program.getSemanticDiagnostics();
      program.getDeclarationDiagnostics();
      program.emit();
    }
  } catch {
    // only the first cells are slower
  }

  (globalThis as Record<symbol, unknown>)[Symbol.for("fringekit.kernelSnapshot")] = {
    format: job.format,
    key: job.key,
    typescriptPath: job.typescriptPath,
    typescript: module.exports,
    parseOptions: job.parseOptions,
    files,
  };
}
