/**
 * Loads tslab's internal modules and checks they are exactly the ones this extension was
 * written against. The extension replaces methods of tslab's ZmqServer and wraps its executor,
 * so any change in tslab must stop the kernel with a clear message rather than misbehave.
 */
import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { registerLoadedModule, requireWithCodeCache } from "./codeCache.js";
import type { KernelSnapshot, SnapshotSourceFiles } from "./startSnapshot.js";

/** The only tslab version the extension supports (package.json pins it exactly). */
export const TSLAB_VERSION = "1.0.22";

/** SHA-256 of the tslab 1.0.22 files whose internals the extension relies on. */
const PINNED_FILES: Record<string, string> = {
  "dist/main.js": "e3b60b922e8ebf203b8f8c666598247f710ffb1b5ad3c145c8b74c5a27e11476",
  "dist/jupyter.js": "186ae73149b280330d965b087933efa9eea51187f319f4163b44ae06327aef5f",
  "dist/executor.js": "0a9b6c73679be6169390df7cb2000121bcddaaa78872a92da1e83a34174e8c9e",
  "dist/public.js": "356dbf62ce5b5f183a6d8fea629292ad3e5ae151770833e563528e2dd2176bf0",
};

/** The executor object tslab's createExecutor returns (the parts the extension uses). */
export interface TslabExecutor {
  execute(src: string): Promise<boolean>;
  interrupt(): void;
  close(): void;
  locals: Record<string, unknown>;
}

/** Console-like sink tslab's executor reports to: `log(lastValue)`, `error(...)` for failures. */
export interface ExecutorConsole {
  log(...args: unknown[]): void;
  error(...args: unknown[]): void;
}

/** tslab's internal modules, typed just enough for the extension. */
export interface TslabInternals {
  root: string;
  version: string;
  main: { startKernel(options: { configPath: string; enableFindLocal?: boolean; jsKernel?: boolean; globalVersion?: string }): void };
  jupyter: {
    ZmqServer: { prototype: Record<string, unknown> };
    JupyterHandlerImpl: { prototype: Record<string, unknown> };
    lastWriteDisplayData: unknown;
  };
  executor: { createExecutor(rootDir: string, convs: unknown, console: ExecutorConsole): TslabExecutor };
  converter: { isCompleteCode(code: string): { completed: boolean; indent: string } };
  typescript: Record<string, unknown> & { version: string };
  /** Writes TypeScript's V8 code cache when this start had none (see codeCache.ts); else no-op. */
  saveCodeCache(): void;
}

/** Thrown when the installed tslab is not the pinned one; names what differs and what to do. */
export class TslabPinError extends Error {
  constructor(problem: string) {
    super(
      `fringekit kernel: ${problem}. The kernel extension wraps tslab ${TSLAB_VERSION} internals and ` +
        `cannot run on a different tslab; reinstall fringekit's dependencies (npm ci) so tslab ${TSLAB_VERSION} is used.`,
    );
    this.name = "TslabPinError";
  }
}

/**
 * Resolves tslab from this package, verifies version, file hashes and the shape of the
 * internals, and returns them. Throws `TslabPinError` on any mismatch.
 * @param fromUrl module URL to resolve tslab from (defaults to this file's URL)
 * @param options resolvePackageExports: adjust the kernel's compiler options (the launcher does);
 *   globalTypes: the FRINGEKIT_KERNEL_TYPES setting (see kernelGlobalTypes); codeCacheDir: load
 *   TypeScript through a V8 code cache kept in that folder (see codeCache.ts); snapshot: the
 *   state of the start-up snapshot this process started from, whose TypeScript is used when it
 *   is the file tslab resolves; sourceFiles: gives the type-checker the snapshot's parsed
 *   declarations and records the programs made (see startSnapshot.ts; needs
 *   resolvePackageExports)
 */
export function loadTslab(
  fromUrl: string = import.meta.url,
  options: { resolvePackageExports?: boolean; globalTypes?: string; codeCacheDir?: string; snapshot?: KernelSnapshot; sourceFiles?: SnapshotSourceFiles } = {},
): TslabInternals {
  const require = createRequire(fromUrl);
  let packageJson: string;
  try {
    packageJson = require.resolve("tslab/package.json");
  } catch {
    throw new TslabPinError("tslab is not installed next to fringekit");
  }
  const root = path.dirname(packageJson);
  const version = JSON.parse(readFileSync(packageJson, "utf8")).version as string;
  if (version !== TSLAB_VERSION) throw new TslabPinError(`found tslab ${version}, need exactly ${TSLAB_VERSION}`);
  for (const [file, want] of Object.entries(PINNED_FILES)) {
    const got = createHash("sha256").update(readFileSync(path.join(root, file))).digest("hex");
    if (got !== want) throw new TslabPinError(`tslab's ${file} differs from the released ${TSLAB_VERSION} (sha256 ${got})`);
  }
  const typescriptPath = require.resolve("@tslab/typescript-for-tslab", { paths: [root] });
  const fromSnapshot = !!options.snapshot && options.snapshot.typescriptPath === typescriptPath && !require.cache[typescriptPath];
  if (fromSnapshot) registerLoadedModule(typescriptPath, options.snapshot!.typescript);
  options.sourceFiles?.typescriptLoaded(fromSnapshot);
  const cached = options.codeCacheDir && !fromSnapshot ? requireWithCodeCache(typescriptPath, options.codeCacheDir) : undefined;
  if (options.resolvePackageExports) {
    const hook = options.sourceFiles && options.codeCacheDir ? programHook(options.sourceFiles, typescriptPath, options.codeCacheDir) : undefined;
    useBundlerResolution(require, typescriptPath, kernelGlobalTypes(options.globalTypes), hook);
  }
  const internals: TslabInternals = {
    root,
    version,
    main: require(path.join(root, "dist/main.js")),
    jupyter: require(path.join(root, "dist/jupyter.js")),
    executor: require(path.join(root, "dist/executor.js")),
    converter: require(path.join(root, "dist/converter.js")),
    typescript: require(typescriptPath),
    saveCodeCache: () => void cached?.saveCache(),
  };
  checkShape(internals);
  return internals;
}

function checkShape(t: TslabInternals): void {
  const need = (ok: boolean, what: string) => {
    if (!ok) throw new TslabPinError(`tslab internals changed: ${what}`);
  };
  need(typeof t.main.startKernel === "function", "main.startKernel is missing");
  const server = t.jupyter.ZmqServer?.prototype;
  need(!!server, "jupyter.ZmqServer is missing");
  for (const method of ["init", "bindSocket", "handleShellMessage", "close"]) {
    need(typeof server[method] === "function", `ZmqServer.prototype.${method} is missing`);
  }
  const handler = t.jupyter.JupyterHandlerImpl?.prototype;
  need(!!handler, "jupyter.JupyterHandlerImpl is missing");
  for (const method of ["handleKernel", "handleComplete", "handleInspect", "handleIsComplete", "close"]) {
    need(typeof handler[method] === "function", `JupyterHandlerImpl.prototype.${method} is missing`);
  }
  need("lastWriteDisplayData" in t.jupyter, "jupyter.lastWriteDisplayData is missing");
  const desc = Object.getOwnPropertyDescriptor(t.executor, "createExecutor");
  need(!!desc && typeof desc.value === "function" && desc.writable === true, "executor.createExecutor is not a replaceable function");
  need(typeof t.converter.isCompleteCode === "function", "converter.isCompleteCode is missing");
  need(typeof t.typescript.createWatchCompilerHost === "function", "typescript.createWatchCompilerHost is missing");
}

/**
 * Global type packages of the kernel's program (TypeScript's `types` option): Node's, plus the
 * names listed in the environment variable FRINGEKIT_KERNEL_TYPES (comma-separated, e.g.
 * `mocha,jquery`; `*` restores TypeScript's default of every package under node_modules/@types).
 * By default TypeScript puts every @types package of the notebook folder into the program (in a
 * development checkout ~45 packages, 4.5 MB of declarations besides @types/node's 2.2 MB), and
 * parsing them was most of the kernel's start. A cell still gets a package's types by importing
 * it (`import $ from "jquery"` finds @types/jquery); only globals of packages it does not import
 * need the variable. `undefined` means TypeScript's default.
 */
export function kernelGlobalTypes(setting: string | undefined): string[] | undefined {
  const extra = (setting ?? "").split(",").map((name) => name.trim()).filter((name) => name !== "");
  if (extra.includes("*")) return undefined;
  return [...new Set(["node", ...extra])];
}

/**
 * Folders whose contents the kernel's type-checker does not watch: node_modules. TypeScript
 * watches them for packages that appear after a failed import; on Linux it emulates a
 * recursive watch by listing and watching every folder of the tree at start (~3000 folders,
 * ~0.75 s in a development checkout). tslab 1.0.22 cannot use those events anyway: when one
 * fires, its converter throws "Unexpected pending rebuildTimer" on the next cell, so a package
 * installed during a session needs a kernel restart either way. Files the program has read
 * (declarations, local modules) keep their own file watchers.
 */
export const KERNEL_WATCH_EXCLUDE = ["**/node_modules"];

/**
 * Adjusts the compiler options of tslab's type-checker: packages resolve through package.json
 * "exports" (TypeScript's "bundler" resolution) instead of Node10 resolution, so cells can import
 * `fringekit`, `fringekit/kernel` and the package from inside its own folder (self-reference);
 * only the global types of kernelGlobalTypes() are loaded and node_modules folders are not
 * watched (KERNEL_WATCH_EXCLUDE). tslab's converter reads compiler options only through
 * createWatchCompilerHost, so the module it loads is swapped, before tslab loads it, for a view
 * that adjusts those options.
 */
function useBundlerResolution(require: NodeJS.Require, typescriptPath: string, types: string[] | undefined, hook: ProgramHook | undefined): void {
  const real = require(typescriptPath) as Record<string, unknown> & {
    createWatchCompilerHost: (...args: unknown[]) => unknown;
    createEmitAndSemanticDiagnosticsBuilderProgram: CreateProgram;
    ModuleResolutionKind: { Bundler: number };
  };
  const cached = require.cache[typescriptPath];
  if (!cached) throw new TslabPinError("TypeScript for tslab did not load as a CommonJS module");
  if ((real as Record<symbol, unknown>)[BUNDLER_VIEW]) return;
  // tslab passes (rootFiles, options, system, createProgram, reportDiagnostic, reportWatchStatus).
  const createWatchCompilerHost = (rootFiles: unknown, compilerOptions: Record<string, unknown>, ...rest: unknown[]) => {
    const options: Record<string, unknown> = { ...compilerOptions, moduleResolution: real.ModuleResolutionKind.Bundler };
    if (types) options.types = types;
    const [system, createProgram, reportDiagnostic, reportWatchStatus] = rest;
    const create = (createProgram as CreateProgram | null | undefined) ?? real.createEmitAndSemanticDiagnosticsBuilderProgram;
    hook?.compilerOptions(options);
    return real.createWatchCompilerHost(rootFiles, options, system, hook ? hookedCreateProgram(real as unknown as TypeScriptApi, create, hook) : create, reportDiagnostic, reportWatchStatus, undefined, {
      excludeDirectories: KERNEL_WATCH_EXCLUDE,
    });
  };
  cached.exports = new Proxy(real, {
    get: (target, property) => {
      if (property === "createWatchCompilerHost") return createWatchCompilerHost;
      if (property === BUNDLER_VIEW) return true;
      return target[property as string];
    },
  });
}

const BUNDLER_VIEW = Symbol.for("fringekit.tslab.bundlerResolution");

/** TypeScript's CreateProgram (a builder program factory), as tslab's watch host calls it. */
type CreateProgram = (rootNames: readonly string[] | undefined, options: Record<string, unknown> | undefined, host: CompilerHostLike | undefined, oldProgram?: BuilderProgramLike, ...rest: unknown[]) => BuilderProgramLike;

interface BuilderProgramLike {
  getProgram(): ProgramLike;
}

interface ProgramLike {
  getSourceFiles(): readonly { fileName: string; isDeclarationFile: boolean }[];
}

/** The watch program's compiler host, as far as the hook uses it. */
interface CompilerHostLike {
  getSourceFile(fileName: string, languageVersionOrOptions: unknown, ...rest: unknown[]): unknown;
  getSourceFileByPath?(fileName: string, path: string, languageVersionOrOptions: unknown, ...rest: unknown[]): unknown;
  fileExists(fileName: string): boolean;
  hasInvalidatedResolutions?(path: string): boolean;
  hasChangedAutomaticTypeDirectiveNames?(): boolean;
}

/** The parts of TypeScript (5.0, tslab's) the hook calls. */
interface TypeScriptApi {
  isProgramUptoDate(
    program: ProgramLike, rootNames: readonly string[], options: Record<string, unknown>, getSourceVersion: (path: string, fileName: string) => string | undefined,
    fileExists: (fileName: string) => boolean, hasInvalidatedResolutions: (path: string) => boolean, hasChangedAutomaticTypeDirectiveNames: (() => boolean) | undefined,
    getParsedCommandLine: undefined, projectReferences: unknown,
  ): boolean;
  getEmitScriptTarget(options: Record<string, unknown>): number;
  getSetExternalModuleIndicator(options: Record<string, unknown>): unknown;
}

/**
 * What the kernel's type-checker asks of the start-up snapshot: parsed declaration files by
 * name (undefined: parse as usual), the compiler options of each program, and each program made.
 */
export interface ProgramHook {
  /** Whether it answers any file (else the program is left entirely to TypeScript). */
  active(): boolean;
  compilerOptions(options: Record<string, unknown>): void;
  getSourceFile(fileName: string, languageVersionOrOptions: unknown): unknown;
  programCreated(program: ProgramLike): void;
}

function programHook(sourceFiles: SnapshotSourceFiles, typescriptPath: string, dir: string): ProgramHook {
  return {
    active: () => sourceFiles.active(),
    compilerOptions: (options) => sourceFiles.compilerOptions(options),
    getSourceFile: (fileName, languageVersionOrOptions) => sourceFiles.get(fileName, languageVersionOrOptions),
    programCreated: (program) => sourceFiles.programCreated(program, typescriptPath, dir),
  };
}

/**
 * Wraps tslab's program factory: the watch program's compiler host answers a declaration file
 * the snapshot holds with the snapshot's SourceFile (the same object for every program, so
 * TypeScript reuses it as it reuses unchanged files), and each program made is reported.
 *
 * The watch program asks for a new program only when its own cache of file versions says
 * something changed, and that cache never sees the snapshot's files, so it would build a new
 * program for every cell, even one that repeats the last (~20 ms). The old program is kept in
 * that case, as the watch program itself keeps it: TypeScript's own isProgramUptoDate, with the
 * snapshot's versions for its files and the watch cache's for the others.
 */
function hookedCreateProgram(ts: TypeScriptApi, create: CreateProgram, hook: ProgramHook): CreateProgram {
  const hooked = new WeakSet<object>();
  return (rootNames, options, host, oldProgram, ...rest) => {
    if (host && !hooked.has(host)) {
      hooked.add(host);
      const getSourceFile = host.getSourceFile.bind(host);
      host.getSourceFile = (fileName, languageVersionOrOptions, ...more) =>
        hook.getSourceFile(fileName, languageVersionOrOptions) ?? getSourceFile(fileName, languageVersionOrOptions, ...more);
      const getSourceFileByPath = host.getSourceFileByPath?.bind(host);
      if (getSourceFileByPath) {
        host.getSourceFileByPath = (fileName, filePath, languageVersionOrOptions, ...more) =>
          hook.getSourceFile(fileName, languageVersionOrOptions) ?? getSourceFileByPath(fileName, filePath, languageVersionOrOptions, ...more);
      }
    }
    if (oldProgram && host?.getSourceFileByPath && rootNames && options && hook.active()) {
      const request = { languageVersion: ts.getEmitScriptTarget(options), impliedNodeFormat: undefined, setExternalModuleIndicator: ts.getSetExternalModuleIndicator(options) };
      const versionOf = (filePath: string, fileName: string) =>
        (host.getSourceFileByPath!(fileName, filePath, request, undefined, false) as { version?: string } | undefined)?.version;
      const fileExists = (fileName: string) => host.fileExists(fileName);
      const invalidated = (filePath: string) => host.hasInvalidatedResolutions?.(filePath) ?? false;
      const unchanged = ts.isProgramUptoDate(oldProgram.getProgram(), rootNames, options, versionOf, fileExists, invalidated, host.hasChangedAutomaticTypeDirectiveNames?.bind(host), undefined, rest[1]);
      if (unchanged) return oldProgram;
    }
    const program = create(rootNames, options, host, oldProgram, ...rest);
    try {
      hook.programCreated(program.getProgram());
    } catch {
      // only the next snapshot is affected
    }
    return program;
  };
}
