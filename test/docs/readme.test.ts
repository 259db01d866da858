// README.md as a test: every fenced block is run with the demo data as input, in a fresh
// folder outside the repository, so an example cannot drift from the program. Command lines
// (```sh blocks and the plain usage listing) run one by one in bash with `npx fringekit`
// resolving to this build; TypeScript blocks run in README order as the cells of one notebook on
// the fringekit kernel (nbclient), as a reader would paste them. A failure names the README
// line. How to mark a block as not run (with a reason): test/docs/readmeBlocks.ts.
import { spawnSync } from "node:child_process";
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, realpathSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { installTempKernel, python, repoRoot, type KernelPrefix } from "../kernel/helpers.js";
import { readmeBlocks, runnableCommand, type ReadmeBlock } from "./readmeBlocks.js";

const readme = readFileSync(path.join(repoRoot, "README.md"), "utf8");
const blocks = readmeBlocks(readme);
const demoData = path.join(repoRoot, "notebooks-demo", "data");
const runNotebook = path.join(repoRoot, "test", "install", "py", "runNotebook.py");

describe("readmeBlocks(markdown)", () => {
  it("finds fenced blocks with their README line, section and skip reason", () => {
    const sample = "# A\ntext\n<!-- readme-test: skip another test runs these steps -->\n\n```sh\nnpm test\n```\n## B\n```ts\nx;\n```\n";
    const found = readmeBlocks(sample);
    expect(found.map((b) => [b.language, b.line, b.section, b.skip, b.lines.map((l) => l.line)])).toEqual([
      ["sh", 5, "A", "another test runs these steps", [6]],
      ["ts", 9, "B", undefined, [10]],
    ]);
  });

  it("refuses a skip marker without a reason, and an unclosed block", () => {
    expect(() => readmeBlocks("<!-- readme-test: skip -->\n```sh\nx\n```\n")).toThrow(/README.md:1: .*reason/);
    expect(() => readmeBlocks("```ts\nx\n")).toThrow(/README.md:1: code block never closed/);
  });

  it("runnableCommand(text) expands optional parts and DIR", () => {
    expect(runnableCommand("npx fringekit models [--json]")).toBe("npx fringekit models --json");
    expect(runnableCommand("npx fringekit kernel install [--user | --prefix DIR]")).toBe("npx fringekit kernel install --prefix readme-prefix");
  });
});

const why = !existsSync(path.join(repoRoot, "dist/cli/main.js")) ? "dist/ is not built (npm run build)"
  : !existsSync(path.join(repoRoot, "widgets/dist/fringekit-embed.js")) ? "widgets/dist/ is not built (npm run build)"
  : spawnSync(python, ["-c", "import nbclient, nbformat, jupyter_client"]).status !== 0 ? "Debian's python3-nbclient is missing" : undefined;
if (why) console.warn(`test/docs/readme: skipped, ${why}`);

const where = (block: ReadmeBlock) => `README.md:${block.line} (section "${block.section}", \`\`\`${block.language} block)`;
const commandBlocks = blocks.filter((b) => b.language === "sh" || b.language === "");
const codeBlocks = blocks.filter((b) => b.language === "ts");

it("README.md has only sh, ts and plain command blocks (a new kind needs a runner here)", () => {
  const other = blocks.filter((b) => !["sh", "ts", ""].includes(b.language));
  expect(other.map(where)).toEqual([]);
});

describe.skipIf(why)("README.md blocks run on the demo data", () => {
  let work = "";
  let kernel: KernelPrefix | null = null;
  let executedCells: { outputs: Record<string, any>[] }[] = [];
  let notebookRun = "";

  beforeAll(() => {
    work = realpathSync(mkdtempSync(path.join(os.tmpdir(), "fringekit-readme-")));
    // The package as an installed dependency of the reader's folder, and the demo data under the
    // names the README uses.
    mkdirSync(path.join(work, "node_modules", ".bin"), { recursive: true });
    symlinkSync(repoRoot, path.join(work, "node_modules", "fringekit"), "dir");
    symlinkSync("../fringekit/bin/fringekit.js", path.join(work, "node_modules", ".bin", "fringekit"));
    for (const [from, to] of [["line-pair-A.csv", "line.csv"], ["line-pair-A.csv", "my-line.csv"], ["frame-pair-C.png", "frame.png"], ["dark-pair-C.png", "dark.png"]]) {
      copyFileSync(path.join(demoData, from!), path.join(work, to!));
    }
    mkdirSync(path.join(work, "data"));
    for (const file of readdirSync(path.join(demoData, "scan")).filter((f) => f.endsWith(".csv"))) copyFileSync(path.join(demoData, "scan", file), path.join(work, "data", file));

    // All TypeScript blocks as one notebook, in README order.
    const runnable = codeBlocks.filter((b) => !b.skip);
    kernel = installTempKernel();
    const notebook = {
      nbformat: 4, nbformat_minor: 5,
      metadata: { kernelspec: { name: "fringekit", display_name: "TypeScript (fringekit)", language: "typescript" } },
      cells: runnable.map((b) => ({ cell_type: "code", metadata: { readme_line: b.line }, source: b.lines.map((l) => l.text).join("\n"), outputs: [], execution_count: null })),
    };
    writeFileSync(path.join(work, "readme.ipynb"), JSON.stringify(notebook));
    const result = spawnSync(python, [runNotebook, "readme.ipynb", "readme.out.ipynb", work, "--allow-errors"], {
      cwd: work, encoding: "utf8", timeout: 900_000, env: { ...process.env, JUPYTER_PATH: kernel.jupyterPath },
    });
    notebookRun = `${result.stdout}\n${result.stderr}`;
    if (existsSync(path.join(work, "readme.out.ipynb"))) executedCells = JSON.parse(readFileSync(path.join(work, "readme.out.ipynb"), "utf8")).cells;
  }, 960_000);

  afterAll(() => {
    kernel?.dispose();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  for (const block of commandBlocks) {
    it.skipIf(block.skip)(`${where(block)}${block.skip ? ` — not run: ${block.skip}` : ""}`, () => {
      const commands = block.lines.filter((l) => l.text.trim() !== "" && !l.text.trim().startsWith("#"));
      expect(commands.length, `${where(block)} holds no command`).toBeGreaterThan(0);
      for (const { text, line } of commands) {
        const command = runnableCommand(text);
        const run = spawnSync("bash", ["-c", command], { cwd: work, encoding: "utf8", timeout: 240_000, env: { ...process.env, NO_COLOR: "1", JUPYTER_DATA_DIR: path.join(work, "jupyter-data") } }); // --user lands here, not in ~
        expect(run.status, `README.md:${line}: \`${command}\` exited ${run.status}:\n${run.stderr || run.stdout}`.slice(0, 3000)).toBe(0);
      }
    }, 600_000);
  }

  const runnable = codeBlocks.filter((b) => !b.skip);
  for (const block of codeBlocks) {
    it.skipIf(block.skip)(`${where(block)} as a notebook cell${block.skip ? ` — not run: ${block.skip}` : ""}`, () => {
      const cell = executedCells[runnable.indexOf(block)];
      expect(cell, `the README notebook did not run:\n${notebookRun}`.slice(0, 3000)).toBeDefined();
      const errors = cell!.outputs.filter((o) => o.output_type === "error").map((o) => `${o.ename}: ${o.evalue}`);
      expect(errors, `${where(block)} failed in the kernel`).toEqual([]);
    });
  }
});
