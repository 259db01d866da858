/**
 * The kernel's start-up snapshot. Most of a kernel start went into tslab's type-checker parsing
 * the same declarations every time (ES2022's lib files and @types/node, ~3 MB, ~0.5 s). A Node
 * start-up snapshot (`node --build-snapshot`, Node's documented "Startup snapshot" API) holds
 * TypeScript for tslab already loaded, those declarations and the ones the cells imported
 * (fringekit's) parsed and bound, and the compiled code of a warm-up; a kernel started with
 * `node --snapshot-blob FILE` (see launch.ts) finds them in memory instead (reading the ~50 MB
 * snapshot takes ~0.25 s).
 *
 * - Built after a start that had no fitting snapshot, by a detached low-priority process
 *   (buildSnapshot.ts → snapshotEntry.ts), verified by starting Node from it, then renamed into
 *   place with a description file (`kernel-INSTALL-KEY.blob` and `.json` in the cache folder;
 *   INSTALL names the installation, see installationPrefix).
 * - KEY covers the Node build (version, arch, executable), NODE_OPTIONS, TypeScript for tslab's
 *   file and this extension's snapshot code, so a blob is only given to a Node that can load it.
 * - Each declaration file is used only while its size and modification time are those parsed,
 *   and only under the same parse options; anything else is parsed as before.
 * - `FRINGEKIT_KERNEL_SNAPSHOT=0` turns it off (no build, no use).
 */
import { spawn } from "node:child_process";
import { createHash } from "node:crypto";
import { closeSync, mkdirSync, openSync, readFileSync, readSync, rmSync, statSync, writeFileSync } from "node:fs";
import { setPriority } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { installationPrefix, markUsed } from "./codeCache.js";

/** Version of the snapshot's contents (raise on any change of KernelSnapshot or the entry). */
export const SNAPSHOT_FORMAT = 1;

/** Global the snapshot entry leaves its state under (a registered symbol survives the snapshot). */
export const SNAPSHOT_GLOBAL = Symbol.for("fringekit.kernelSnapshot");

/** Declarations larger than this in total are not put into a snapshot, bytes. */
const MAX_SNAPSHOT_SOURCE_BYTES = 32 * 1024 * 1024;

/**
 * Compiler options that change how a declaration file is parsed or bound; a snapshot's files are
 * used only when the kernel's values of these equal the ones they were parsed with.
 */
const PARSE_OPTION_NAMES = [
  "target", "module", "moduleResolution", "moduleDetection", "jsx", "allowJs", "checkJs", "strict", "alwaysStrict",
  "preserveConstEnums", "isolatedModules", "verbatimModuleSyntax", "experimentalDecorators", "useDefineForClassFields",
] as const;

/** One declaration file as parsed into a snapshot. */
export interface SnapshotFile {
  fileName: string;
  /** Size (bytes) and modification time (ms) of the file that was parsed. */
  size: number;
  mtimeMs: number;
  /** TypeScript's SourceFile, parsed and bound. */
  sourceFile: { version?: string };
}

/** The state a snapshot holds (left by snapshotEntry.ts under SNAPSHOT_GLOBAL). */
export interface KernelSnapshot {
  format: number;
  key: string;
  typescriptPath: string;
  /** TypeScript for tslab's module exports, loaded while the snapshot was built. */
  typescript: Record<string, unknown>;
  /** JSON of the parse options the files were parsed with (see parseOptionsOf). */
  parseOptions: string;
  files: Map<string, SnapshotFile>;
}

/** What buildSnapshot.ts is asked to build (written as JSON beside the blob). */
export interface SnapshotJob {
  format: number;
  key: string;
  typescriptPath: string;
  /** The parse options (see parseOptionsOf) as a JSON object. */
  parseOptions: string;
  files: { fileName: string; size: number; mtimeMs: number }[];
  /** Final paths of the blob and its description file. */
  blob: string;
  meta: string;
}

/** The description file written beside a verified blob. */
export interface SnapshotMeta {
  format: number;
  key: string;
  typescriptPath: string;
  nodeVersion: string;
  /** Size of the blob, bytes (a partly written blob never matches). */
  blobBytes: number;
  /** Its first bytes, hex: Node aborts on a blob whose header is damaged, so it is checked first. */
  head?: string;
  files: number;
  /** Set instead of blobBytes when building failed: no new attempt for this KEY. */
  failed?: string;
}

/** The snapshot state of this process, when it was started from a snapshot. */
export function currentSnapshot(): KernelSnapshot | undefined {
  const state = (globalThis as Record<symbol, unknown>)[SNAPSHOT_GLOBAL] as KernelSnapshot | undefined;
  return state && state.format === SNAPSHOT_FORMAT ? state : undefined;
}

/**
 * Whether snapshots are turned off: FRINGEKIT_KERNEL_SNAPSHOT=0, or on Windows (the launcher
 * passes signals on to the kernel it starts, which Windows has not).
 */
export function snapshotsDisabled(env: NodeJS.ProcessEnv = process.env): boolean {
  return env.FRINGEKIT_KERNEL_SNAPSHOT === "0" || process.platform === "win32";
}

/** Compiled files of the snapshot machinery (dist/kernel-ext/...). */
export function snapshotScripts(): { entry: string; builder: string; launcher: string } {
  return {
    entry: fileURLToPath(new URL("./snapshotEntry.js", import.meta.url)),
    builder: fileURLToPath(new URL("./buildSnapshot.js", import.meta.url)),
    launcher: fileURLToPath(new URL("./launch.js", import.meta.url)),
  };
}

/**
 * KEY of the snapshot for this Node and `typescriptPath`: the Node build, NODE_OPTIONS (Node
 * refuses a snapshot made under other V8 options), TypeScript's file and the snapshot entry's
 * file (path, size, modification time), and SNAPSHOT_FORMAT.
 */
export function snapshotKey(typescriptPath: string): string {
  const parts = [String(SNAPSHOT_FORMAT), process.version, process.arch, process.execPath, process.env.NODE_OPTIONS ?? ""];
  for (const file of [typescriptPath, snapshotScripts().entry]) {
    const stat = statSync(file);
    parts.push(file, String(stat.size), String(stat.mtimeMs));
  }
  return createHash("sha256").update(parts.join("\0")).digest("hex").slice(0, 16);
}

/**
 * Paths of the blob, description and lock file for KEY in `dir`, named after the installation
 * (see installationPrefix: TypeScript's path and the Node executable), and that prefix.
 */
export function snapshotFiles(dir: string, typescriptPath: string, key: string): { blob: string; meta: string; lock: string; prefix: string } {
  const prefix = installationPrefix("kernel", typescriptPath);
  const base = path.join(dir, `${prefix}${key}`);
  return { blob: `${base}.blob`, meta: `${base}.json`, lock: `${base}.lock`, prefix };
}

/** Reads the description file for KEY, or undefined (missing, unreadable, another format). */
export function readSnapshotMeta(dir: string, typescriptPath: string, key: string): SnapshotMeta | undefined {
  try {
    const meta = JSON.parse(readFileSync(snapshotFiles(dir, typescriptPath, key).meta, "utf8")) as SnapshotMeta;
    return meta.format === SNAPSHOT_FORMAT && meta.key === key ? meta : undefined;
  } catch {
    return undefined;
  }
}

/**
 * The blob to start the kernel from, or undefined: the description says it was verified for
 * this KEY and the blob has the size written there. Never throws.
 */
export function usableSnapshot(dir: string, typescriptPath: string): string | undefined {
  try {
    const key = snapshotKey(typescriptPath);
    const meta = readSnapshotMeta(dir, typescriptPath, key);
    if (!meta || meta.failed || !meta.blobBytes) return undefined;
    const { blob } = snapshotFiles(dir, typescriptPath, key);
    if (statSync(blob).size !== meta.blobBytes || blobHead(blob) !== meta.head) return undefined;
    markUsed(blob);
    return blob;
  } catch {
    return undefined;
  }
}

/** Bytes of a blob's header compared before a kernel starts from it. */
const HEAD_BYTES = 64;

/** The first bytes of `blob` as hex (see SnapshotMeta.head). */
export function blobHead(blob: string): string {
  const fd = openSync(blob, "r");
  try {
    const head = Buffer.alloc(HEAD_BYTES);
    return head.subarray(0, readSync(fd, head, 0, HEAD_BYTES, 0)).toString("hex");
  } finally {
    closeSync(fd);
  }
}

/** A failed build is not tried again for this long (same KEY), ms. */
const RETRY_FAILED_BUILD_MS = 86_400_000;

/** Whether a build for `typescriptPath` failed within the last day (its KEY is not tried again). */
export function snapshotBuildFailed(dir: string, typescriptPath: string): boolean {
  try {
    const key = snapshotKey(typescriptPath);
    if (!readSnapshotMeta(dir, typescriptPath, key)?.failed) return false;
    return Date.now() - statSync(snapshotFiles(dir, typescriptPath, key).meta).mtimeMs < RETRY_FAILED_BUILD_MS;
  } catch {
    return false;
  }
}

/** JSON of the compiler options that matter for parsing and binding (PARSE_OPTION_NAMES). */
export function parseOptionsOf(options: Record<string, unknown>): string {
  const picked: Record<string, unknown> = {};
  for (const name of PARSE_OPTION_NAMES) if (options[name] !== undefined) picked[name] = options[name];
  return JSON.stringify(picked);
}

/** A TypeScript Program, as far as the snapshot needs it. */
interface ProgramLike {
  getSourceFiles(): readonly { fileName: string; isDeclarationFile: boolean }[];
}

/**
 * Supplies the kernel's type-checker with the snapshot's parsed declarations and records which
 * declarations a start needs, for the next snapshot. Used by tslabPin (see ProgramHook there).
 */
export class SnapshotSourceFiles {
  private files: Map<string, SnapshotFile> | undefined;
  private readonly hits = new Set<string>();
  private target: { typescriptPath: string; dir: string } | undefined;
  private firstFiles: string[] | undefined;
  private latest: ProgramLike | undefined;
  /** The files of the job last handed out (a later build is only for files beyond them). */
  private scheduled: Set<string> | undefined;
  private parseOptions: string | undefined;

  constructor(private readonly snapshot: KernelSnapshot | undefined) {
    this.files = snapshot?.files;
  }

  /** Called once TypeScript is loaded: the snapshot's files only go with its own TypeScript. */
  typescriptLoaded(fromSnapshot: boolean): void {
    if (!fromSnapshot) this.files = undefined;
  }

  /** Whether the snapshot's files are in use (its TypeScript and parse options fit). */
  active(): boolean {
    return this.files !== undefined;
  }

  /** Called with the compiler options of each type-checker tslab creates. */
  compilerOptions(options: Record<string, unknown>): void {
    this.parseOptions ??= parseOptionsOf(options);
    if (this.snapshot && this.snapshot.parseOptions !== parseOptionsOf(options)) this.files = undefined;
  }

  /**
   * The snapshot's SourceFile for `fileName`, if the file on disk is still the one parsed and the
   * requested parse (language version, module format) is the snapshot's; else undefined.
   */
  get(fileName: string, languageVersionOrOptions: unknown): unknown {
    const entry = this.files?.get(fileName);
    if (!entry) return undefined;
    const request = typeof languageVersionOrOptions === "object" && languageVersionOrOptions !== null
      ? (languageVersionOrOptions as { languageVersion?: unknown; impliedNodeFormat?: unknown })
      : { languageVersion: languageVersionOrOptions, impliedNodeFormat: undefined };
    const parsed = entry.sourceFile as { languageVersion?: unknown; impliedNodeFormat?: unknown };
    if (request.languageVersion !== parsed.languageVersion || request.impliedNodeFormat !== parsed.impliedNodeFormat) return undefined;
    if (!this.hits.has(fileName)) {
      try {
        const stat = statSync(fileName);
        if (stat.size !== entry.size || stat.mtimeMs !== entry.mtimeMs) return undefined;
      } catch {
        return undefined;
      }
      this.hits.add(fileName);
    }
    return entry.sourceFile;
  }

  /**
   * Called with each program the kernel's type-checker makes: the first one's declaration files
   * (ES2022 and the global types) must be in the snapshot; the latest one's (those the cells
   * imported so far, such as fringekit's own) go in too, so the next first cell need not parse
   * them with not yet optimized code.
   */
  programCreated(program: ProgramLike, typescriptPath: string, dir: string): void {
    if (this.parseOptions === undefined) return;
    this.target ??= { typescriptPath, dir };
    this.firstFiles ??= declarationFiles(program).map((file) => file.fileName);
    this.latest = program;
  }

  /**
   * Whether a new snapshot would serve the next start better: there is none, it missed a file
   * of the first program, or the cells imported packages' declarations it lacks (after a job
   * was handed out: declarations beyond that job's).
   */
  needsBuild(): boolean {
    if (!this.firstFiles || !this.latest) return false;
    // Declarations of packages the cells imported that the snapshot lacks (the notebook's own
    // files change too often to be worth a build).
    const lacking = (has: (fileName: string) => boolean) =>
      declarationFiles(this.latest!).some((file) => !has(file.fileName) && file.fileName.includes("/node_modules/"));
    const scheduled = this.scheduled;
    if (scheduled) return lacking((fileName) => scheduled.has(fileName));
    const files = this.files;
    if (!files) return true;
    if (this.firstFiles.some((fileName) => !this.hits.has(fileName))) return true;
    return lacking((fileName) => files.has(fileName));
  }

  /**
   * The job for a new snapshot: the declaration files of the latest program and those of the
   * snapshot this start used (so notebooks importing different packages do not take turns),
   * up to MAX_SNAPSHOT_SOURCE_BYTES, the first program's first.
   */
  buildJob(): SnapshotJob | undefined {
    if (!this.target || !this.latest || !this.firstFiles || this.parseOptions === undefined) return undefined;
    const names = [...new Set([...this.firstFiles, ...declarationFiles(this.latest).map((file) => file.fileName), ...(this.files?.keys() ?? [])])];
    const files: SnapshotJob["files"] = [];
    let bytes = 0;
    for (const fileName of names) {
      try {
        const stat = statSync(fileName);
        if (!stat.isFile() || bytes + stat.size > MAX_SNAPSHOT_SOURCE_BYTES) continue;
        bytes += stat.size;
        files.push({ fileName, size: stat.size, mtimeMs: stat.mtimeMs });
      } catch {
        continue; // tslab's in-memory files (the previous cells' declarations) are not on disk
      }
    }
    if (files.length === 0) return undefined;
    this.scheduled = new Set(files.map((file) => file.fileName));
    try {
      const { typescriptPath, dir } = this.target;
      const key = snapshotKey(typescriptPath);
      const { blob, meta } = snapshotFiles(dir, typescriptPath, key);
      return { format: SNAPSHOT_FORMAT, key, typescriptPath, parseOptions: this.parseOptions, files, blob, meta };
    } catch {
      return undefined;
    }
  }
}

/** The declaration files of `program` with an absolute path (tslab's in-memory ones included). */
function declarationFiles(program: ProgramLike): { fileName: string }[] {
  return program.getSourceFiles().filter((file) => file.isDeclarationFile && path.isAbsolute(file.fileName));
}

/** Source files for this start: the snapshot's when started from one (see SnapshotSourceFiles). */
export function snapshotSourceFiles(snapshot: KernelSnapshot | undefined): SnapshotSourceFiles {
  return new SnapshotSourceFiles(snapshot);
}

/**
 * Starts buildSnapshot.ts for `job`, detached and at the lowest priority, so it neither holds
 * the kernel open nor competes with cells. Never throws; failures are only logged.
 */
export function scheduleSnapshotBuild(dir: string, job: SnapshotJob | undefined, log: (line: string) => void): void {
  if (!job) return;
  try {
    const jobFile = `${job.blob}.job.json`;
    mkdirSync(dir, { recursive: true });
    writeFileSync(jobFile, JSON.stringify(job));
    const child = spawn(process.execPath, [snapshotScripts().builder, jobFile], { detached: true, stdio: "ignore", cwd: dir });
    child.on("error", () => undefined);
    if (child.pid) {
      try {
        setPriority(child.pid, 19);
      } catch {
        // not permitted here: it runs at normal priority
      }
    }
    child.unref();
  } catch (error) {
    log(`start-up snapshot not built: ${(error as Error).message}`);
  }
}

/**
 * Takes the build lock `lock` (an exclusive create); a lock older than `staleMs` (a build that
 * died) is taken over. Returns a release function, or undefined when another build holds it.
 */
export function takeBuildLock(lock: string, staleMs = 10 * 60_000): (() => void) | undefined {
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      closeSync(openSync(lock, "wx"));
      return () => rmSync(lock, { force: true });
    } catch {
      try {
        if (Date.now() - statSync(lock).mtimeMs < staleMs) return undefined;
        rmSync(lock, { force: true });
      } catch {
        return undefined;
      }
    }
  }
  return undefined;
}
