import { defineConfig } from "vitest/config";

// Integration tests start Jupyter kernels, servers and Chromium: generous timeouts,
// and few workers because CI machines have 2 cores.
export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    // Kernel caches go to a temporary folder for the run, not the home folder.
    globalSetup: ["test/cacheDir.setup.ts"],
    testTimeout: 120_000,
    hookTimeout: 180_000,
    pool: "forks",
    maxWorkers: 2,
  },
});
