// Global setup of the test run: kernels started by tests write their caches (TypeScript's code
// cache, the start-up snapshot; kernel-ext/codeCache.ts, startSnapshot.ts) into one temporary
// folder for the whole run instead of the developer's or CI's home folder, removed afterwards.
// Test workers inherit the variable (they are started after this setup).
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

export default function setup(): () => void {
  if (process.env.FRINGEKIT_CACHE_DIR) return () => undefined; // chosen by whoever runs the tests
  const dir = mkdtempSync(path.join(tmpdir(), "fringekit-test-cache-"));
  process.env.FRINGEKIT_CACHE_DIR = dir;
  return () => {
    delete process.env.FRINGEKIT_CACHE_DIR;
    rmSync(dir, { recursive: true, force: true });
  };
}
