/**
 * Loads a large CommonJS module through V8's code cache, so a kernel start does not compile
 * it again. TypeScript for tslab is one 9 MB file; compiling its top level and, later, each
 * function the type-checker calls costs ~0.1–0.2 s per start. Node 20 has no built-in
 * persistent compile cache (module.enableCompileCache came in Node 22), so the module is
 * compiled here with `vm.Script` and `cachedData` (Node's documented vm API), as Node's own
 * CommonJS loader would compile it (Module.wrap, same require, module, __filename, __dirname).
 *
 * The cache file is keyed by the module's path, size and modification time and by the Node
 * version; V8 itself also rejects data made for another source or V8 build
 * (`script.cachedDataRejected`), in which case the module still loads normally and the cache
 * is written anew. Any file-system failure only means no cache.
 */
import { createHash } from "node:crypto";
import { mkdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
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

/** Name of the cache file for `modulePath` (path, size, mtime, Node version and arch). */
export function cacheFileName(modulePath: string): string {
  const stat = statSync(modulePath);
  const key = createHash("sha256").update(`${modulePath}\0${stat.size}\0${stat.mtimeMs}\0${process.version}\0${process.arch}`).digest("hex").slice(0, 16);
  return `${path.basename(modulePath, ".js")}-${key}.v8cache`;
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

  // The same module object Node's loader would make, registered before running (cycles).
  const ModuleClass = Module as unknown as new (id: string, parent?: unknown) => NodeJS.Module & { paths: string[] };
  const mod = new ModuleClass(modulePath);
  mod.filename = modulePath;
  mod.paths = (Module as unknown as { _nodeModulePaths(dir: string): string[] })._nodeModulePaths(path.dirname(modulePath));
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
