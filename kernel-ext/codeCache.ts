/**
 * Loads a large CommonJS module through V8's code cache, so a kernel start does not compile
 * it again. TypeScript for tslab is one 9 MB file; compiling its top level and, later, each
 * function the type-checker calls costs ~0.1–0.2 s per start. Node 20 has no built-in
 * persistent compile cache (module.enableCompileCache came in Node 22), so the module is
 * compiled here with `vm.Script` and `cachedData` (Node's documented vm API), as Node's own
 * CommonJS loader would compile it (Module.wrap, same require, module, __filename, __dirname).
 *
 * The cache file is named by the installation (module path, Node executable) and keyed by the
 * module's size and modification time and the Node version; V8 itself also rejects data made
 * for another source or V8 build (`script.cachedDataRejected`), in which case the module still
 * loads normally and the cache is written anew. Any file-system failure only means no cache.
 * Writing a cache prunes the folder (pruneCache): the same installation's files for other
 * versions, and files of any installation not used for UNUSED_CACHE_DAYS.
 */
import { createHash } from "node:crypto";
import { mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, utimesSync, writeFileSync } from "node:fs";
import { createRequire, Module } from "node:module";
import { homedir } from "node:os";
import path from "node:path";
import vm from "node:vm";

/** A module loaded with a code cache; `saveCache()` writes the cache when it was missing or stale. */
export interface CachedModule {
  exports: unknown;
  /** Whether V8 used a cache file for this load. */
  cacheUsed: boolean;
  /**
   * Writes the code cache (atomically: temp file + rename) if this load did not use one.
   * Call it after the module's hot functions have run, so their compiled code is included.
   * Returns the file written, or undefined when nothing was written (cache was used, or the
   * folder cannot be written).
   */
  saveCache(): string | undefined;
}

/**
 * The folder for fringekit's caches: $FRINGEKIT_CACHE_DIR, else $XDG_CACHE_HOME/fringekit,
 * else ~/.cache/fringekit (the XDG base-directory convention).
 */
export function cacheDir(env: NodeJS.ProcessEnv = process.env): string {
  if (env.FRINGEKIT_CACHE_DIR) return path.resolve(env.FRINGEKIT_CACHE_DIR);
  return path.join(env.XDG_CACHE_HOME || path.join(homedir(), ".cache"), "fringekit");
}

/** Days after which a cache file nobody used is removed (used files are touched once a day). */
export const UNUSED_CACHE_DAYS = 30;

const DAY_MS = 86_400_000;
/** Temp files older than this are left over from a crashed writer, ms. */
const STALE_TEMP_MS = 3_600_000;

const hash8 = (text: string) => createHash("sha256").update(text).digest("hex").slice(0, 8);

/**
 * Prefix naming one installation in cache file names: `NAME-INSTALL-` where INSTALL hashes
 * `installation` with the Node executable, so two Node installations keep their own files.
 */
export function installationPrefix(name: string, installation: string): string {
  return `${name}-${hash8(`${installation}\0${process.execPath}`)}-`;
}

/**
 * Name of the cache file for `modulePath`: the installation prefix (module path, Node
 * executable), then a key of the module's size and modification time, Node version and arch.
 */
export function cacheFileName(modulePath: string): string {
  const stat = statSync(modulePath);
  const key = createHash("sha256").update(`${stat.size}\0${stat.mtimeMs}\0${process.version}\0${process.arch}`).digest("hex").slice(0, 16);
  return `${installationPrefix(path.basename(modulePath, ".js"), modulePath)}${key}.v8cache`;
}

/**
 * fringekit's own cache files: code caches and start-up snapshots (with their description, lock
 * and job files) in this and earlier naming, and the temp files they are written through.
 */
const OWN_CACHE_FILE = /^(?:[\w.@]+-[0-9a-f]{8}-[0-9a-f]{16}\.v8cache|typescript-[0-9a-f]{16}\.v8cache|kernel-[0-9a-f]{8}-[0-9a-f]{16}\.(?:blob|json|lock|entry\.js|blob\.job\.json))(\.\d+\.tmp)?$/;

/**
 * Removes fringekit's cache files from `dir` that are no longer of use: files of the installation
 * `prefix` (see installationPrefix) other than `keep` (it changed version), files of any
 * installation unused for UNUSED_CACHE_DAYS, and temp files older than an hour. Only names
 * matching fringekit's own patterns are touched; a file in use by a running kernel stays
 * readable (removal only unlinks it). Never throws.
 * @param dir the cache folder (see cacheDir)
 * @param prefix this installation's prefix; files starting with it and not in keep are removed
 * @param keep names (in dir) to keep
 * @param now current time, ms since the epoch
 * @returns the names removed
 */
export function pruneCache(dir: string, prefix: string, keep: readonly string[], now: number = Date.now()): string[] {
  const removed: string[] = [];
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return removed;
  }
  for (const name of names) {
    const match = OWN_CACHE_FILE.exec(name);
    if (!match || keep.includes(name)) continue;
    try {
      const age = now - statSync(path.join(dir, name)).mtimeMs;
      const isTemp = match[1] !== undefined;
      const obsolete = isTemp ? age > STALE_TEMP_MS : name.startsWith(prefix) || age > UNUSED_CACHE_DAYS * DAY_MS;
      if (!obsolete) continue;
      rmSync(path.join(dir, name), { force: true });
      removed.push(name);
    } catch {
      // removed by another kernel meanwhile, or not ours to remove: leave it
    }
  }
  return removed;
}

/** Marks `file` as used (modification time now) when it was last marked over a day ago. Never throws. */
export function markUsed(file: string, now: number = Date.now()): void {
  try {
    if (now - statSync(file).mtimeMs > DAY_MS) utimesSync(file, now / 1000, now / 1000);
  } catch {
    // read-only cache folder: the file may be pruned after UNUSED_CACHE_DAYS and rebuilt
  }
}

/**
 * Registers `exports` as the loaded CommonJS module `modulePath` in `require.cache`, so later
 * `require` calls (tslab's) get this instance.
 */
export function registerLoadedModule(modulePath: string, exports: unknown): void {
  const mod = newModule(modulePath);
  mod.exports = exports;
  mod.loaded = true;
  createRequire(modulePath).cache[modulePath] = mod;
}

function newModule(modulePath: string): NodeJS.Module {
  // The same module object Node's loader would make.
  const ModuleClass = Module as unknown as new (id: string, parent?: unknown) => NodeJS.Module & { paths: string[] };
  const mod = new ModuleClass(modulePath);
  mod.filename = modulePath;
  mod.paths = (Module as unknown as { _nodeModulePaths(dir: string): string[] })._nodeModulePaths(path.dirname(modulePath));
  return mod;
}

/**
 * Loads the CommonJS file `modulePath` into `require.cache` (so later `require` calls get this
 * instance) using the code cache in `dir`. If the module is already loaded, returns it as is.
 * @param modulePath absolute path of a CommonJS .js file
 * @param dir cache folder (see cacheDir)
 */
export function requireWithCodeCache(modulePath: string, dir: string = cacheDir()): CachedModule {
  const require = createRequire(modulePath);
  const loaded = require.cache[modulePath];
  if (loaded) return { exports: loaded.exports, cacheUsed: false, saveCache: () => undefined };

  let cacheFile: string | undefined;
  let cachedData: Buffer | undefined;
  try {
    cacheFile = path.join(dir, cacheFileName(modulePath));
    cachedData = readFileSync(cacheFile);
  } catch {
    cachedData = undefined; // no cache yet (or unreadable): compile normally
  }
  const source = readFileSync(modulePath, "utf8");
  const script = new vm.Script(Module.wrap(source), { filename: modulePath, cachedData });
  const cacheUsed = cachedData !== undefined && !script.cachedDataRejected;
  if (cacheUsed && cacheFile) markUsed(cacheFile);

  // Registered before running, as Node's loader does (cycles).
  const mod = newModule(modulePath);
  require.cache[modulePath] = mod;
  try {
    const wrapper = script.runInThisContext() as (this: unknown, ...args: unknown[]) => void;
    wrapper.call(mod.exports, mod.exports, require, mod, modulePath, path.dirname(modulePath));
  } catch (error) {
    delete require.cache[modulePath];
    throw error;
  }
  mod.loaded = true;

  let saved = cacheUsed;
  return {
    get exports() {
      return mod.exports;
    },
    cacheUsed,
    saveCache() {
      if (saved || !cacheFile) return undefined;
      saved = true;
      const temp = `${cacheFile}.${process.pid}.tmp`;
      try {
        mkdirSync(dir, { recursive: true });
        writeFileSync(temp, script.createCachedData());
        renameSync(temp, cacheFile);
        pruneCache(dir, installationPrefix(path.basename(modulePath, ".js"), modulePath), [path.basename(cacheFile)]);
        return cacheFile;
      } catch {
        try {
          rmSync(temp, { force: true });
        } catch {
          // the folder itself is missing or not a folder: nothing was written
        }
        return undefined; // read-only home, full disk: the kernel works without a cache
      }
    },
  };
}
