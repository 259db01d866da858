// requireWithCodeCache: a CommonJS file loaded through vm.Script with V8's code cache behaves as
// Node's own loader (Node.js docs, "Modules: CommonJS modules", "The module wrapper": exports,
// require, module, __filename, __dirname), and the cache is used, refreshed and optional.
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, utimesSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { cacheDir, cacheFileName, installationPrefix, markUsed, pruneCache, requireWithCodeCache, UNUSED_CACHE_DAYS } from "../../kernel-ext/codeCache.js";

const builtCodeCache = fileURLToPath(new URL("../../dist/kernel-ext/codeCache.js", import.meta.url));
if (!existsSync(builtCodeCache)) throw new Error("codeCache.test needs the build: run `npm run build` first");

let dir = "";
let modulePath = "";
let cache = "";
const require = createRequire(import.meta.url);

beforeEach(() => {
  dir = mkdtempSync(path.join(tmpdir(), "fringekit-codecache-"));
  cache = path.join(dir, "cache");
  modulePath = path.join(dir, "big.cjs");
  writeFileSync(path.join(dir, "helper.cjs"), "exports.twice = (x) => 2 * x;\n");
  writeFileSync(modulePath, 'const { twice } = require("./helper.cjs");\nmodule.exports = { answer: twice(21), file: __filename, dir: __dirname, self: module.id, isThis: this === module.exports };\n');
});
afterEach(() => {
  for (const key of Object.keys(require.cache)) if (key.startsWith(dir)) delete require.cache[key];
  rmSync(dir, { recursive: true, force: true });
});

/** Loads the module in a fresh Node through the built dist/kernel-ext/codeCache.js and saves. */
function inChild(): { answer: number; cacheUsed: boolean; saved: boolean } {
  const code = `import { requireWithCodeCache } from ${JSON.stringify(pathToFileURL(builtCodeCache).href)};
const m = requireWithCodeCache(${JSON.stringify(modulePath)}, ${JSON.stringify(cache)});
console.log(JSON.stringify({ answer: m.exports.answer, cacheUsed: m.cacheUsed, saved: m.saveCache() !== undefined }));`;
  const run = spawnSync(process.execPath, ["--input-type=module", "-e", code], { encoding: "utf8" });
  expect(run.status, run.stderr).toBe(0);
  return JSON.parse(run.stdout);
}

describe("requireWithCodeCache(modulePath, dir)", () => {
  it("requireWithCodeCache(file, dir) gives the exports, __filename and __dirname Node's loader gives", () => {
    const loaded = requireWithCodeCache(modulePath, cache);
    expect(loaded.exports).toEqual({ answer: 42, file: modulePath, dir, self: modulePath, isThis: true });
    expect(require(modulePath)).toBe(loaded.exports); // later require() calls get the same instance
  });

  // Fresh processes: within one process V8's in-memory compilation cache would answer first.
  it("requireWithCodeCache(file, dir) in a later process uses the cache that saveCache() wrote", () => {
    expect(inChild()).toEqual({ answer: 42, cacheUsed: false, saved: true });
    expect(readdirSync(cache)).toHaveLength(1);
    expect(inChild()).toEqual({ answer: 42, cacheUsed: true, saved: false });
  });

  it("requireWithCodeCache(file, dir) after the file changed runs the new source and replaces the cache", () => {
    requireWithCodeCache(modulePath, cache).saveCache();
    const old = readdirSync(cache);
    delete require.cache[modulePath];
    writeFileSync(modulePath, "module.exports = { answer: 43, longer: true };\n");
    const changed = requireWithCodeCache(modulePath, cache);
    expect(changed.cacheUsed).toBe(false);
    expect(changed.exports).toEqual({ answer: 43, longer: true });
    changed.saveCache();
    // The same installation's cache for the old source is pruned when the new one is written.
    expect(readdirSync(cache)).toEqual([cacheFileName(modulePath)]);
    expect(old).not.toContain(cacheFileName(modulePath));
  });

  it("requireWithCodeCache(file, dir) with a corrupt cache file loads normally and rewrites it", () => {
    inChild();
    const [name] = readdirSync(cache);
    writeFileSync(path.join(cache, name!), Buffer.from("not a V8 code cache"));
    expect(inChild()).toEqual({ answer: 42, cacheUsed: false, saved: true });
    expect(inChild()).toEqual({ answer: 42, cacheUsed: true, saved: false });
  });

  it("saveCache() into a folder that cannot be made returns undefined and leaves no temp file", () => {
    const blocker = path.join(dir, "a-file");
    writeFileSync(blocker, "");
    const loaded = requireWithCodeCache(modulePath, path.join(blocker, "cache"));
    expect(loaded.saveCache()).toBeUndefined();
    expect((loaded.exports as { answer: number }).answer).toBe(42);
    expect(readdirSync(dir).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });
});

describe("pruneCache(dir, prefix, keep, now)", () => {
  const DAY = 86_400_000;
  const now = Date.UTC(2030, 0, 31);
  const touch = (name: string, ageMs: number) => {
    writeFileSync(path.join(cache, name), "x");
    utimesSync(path.join(cache, name), (now - ageMs) / 1000, (now - ageMs) / 1000);
  };

  it("pruneCache() removes this installation's other versions, files unused for UNUSED_CACHE_DAYS and stale temp files, and nothing else", () => {
    mkdirSync(cache, { recursive: true });
    const mine = installationPrefix("typescript", "/opt/a/typescript.js");
    const other = installationPrefix("typescript", "/opt/b/typescript.js");
    touch(`${mine}${"1".repeat(16)}.v8cache`, 0); // kept: the current one
    touch(`${mine}${"2".repeat(16)}.v8cache`, 0); // same installation, other version
    touch(`${other}${"3".repeat(16)}.v8cache`, DAY); // another installation, recently used
    touch(`${other}${"4".repeat(16)}.v8cache`, (UNUSED_CACHE_DAYS + 1) * DAY); // another installation, unused
    touch(`typescript-${"5".repeat(16)}.v8cache`, 2 * DAY); // earlier naming, recently used
    touch(`kernel-${"6".repeat(8)}-${"7".repeat(16)}.blob.123.tmp`, 2 * 3_600_000); // a crashed writer's temp file
    touch(`kernel-${"6".repeat(8)}-${"7".repeat(16)}.blob.124.tmp`, 60_000); // a writer at work
    touch("notes.txt", 400 * DAY); // not fringekit's
    touch(`typescript-${"8".repeat(16)}.v8cache.bak`, 400 * DAY); // not fringekit's naming
    const removed = pruneCache(cache, mine, [`${mine}${"1".repeat(16)}.v8cache`], now);
    expect(removed.sort()).toEqual([`${mine}${"2".repeat(16)}.v8cache`, `${other}${"4".repeat(16)}.v8cache`, `kernel-${"6".repeat(8)}-${"7".repeat(16)}.blob.123.tmp`].sort());
    expect(readdirSync(cache).sort()).toEqual([
      `${mine}${"1".repeat(16)}.v8cache`, `${other}${"3".repeat(16)}.v8cache`, `typescript-${"5".repeat(16)}.v8cache`,
      `kernel-${"6".repeat(8)}-${"7".repeat(16)}.blob.124.tmp`, "notes.txt", `typescript-${"8".repeat(16)}.v8cache.bak`,
    ].sort());
  });

  it("pruneCache(missing folder) removes nothing and does not throw", () => {
    expect(pruneCache(path.join(dir, "none"), "typescript-00000000-", [])).toEqual([]);
  });

  it("markUsed(file) renews a file last marked over a day ago, so pruning keeps what is in use", () => {
    mkdirSync(cache, { recursive: true });
    const used = `${installationPrefix("typescript", "/opt/c/typescript.js")}${"9".repeat(16)}.v8cache`;
    const unused = `${installationPrefix("typescript", "/opt/d/typescript.js")}${"9".repeat(16)}.v8cache`;
    touch(used, 10 * DAY);
    touch(unused, 10 * DAY);
    markUsed(path.join(cache, used), now);
    const removed = pruneCache(cache, "typescript-00000000-", [], now + (UNUSED_CACHE_DAYS - 5) * DAY);
    expect(removed).toEqual([unused]);
  });
});

describe("cacheDir(env)", () => {
  it("cacheDir(env) follows FRINGEKIT_CACHE_DIR, then XDG_CACHE_HOME/fringekit (XDG base-directory spec)", () => {
    expect(cacheDir({ FRINGEKIT_CACHE_DIR: "/srv/c", XDG_CACHE_HOME: "/x" })).toBe(path.resolve("/srv/c"));
    expect(cacheDir({ XDG_CACHE_HOME: "/x" })).toBe(path.join("/x", "fringekit"));
    expect(cacheDir({})).toMatch(/\.cache[\\/]fringekit$/);
  });
});
