/**
 * Static HTML export of an executed notebook whose widgets still work with no kernel and no
 * network: the widget state saved in the notebook's metadata is embedded, and one inlined
 * renderer script draws every widget from it (sliders recompute in the page, Fit runs the
 * fitter in a Web Worker). A notebook is untrusted input: only fringekit's own widget models
 * are embedded (other libraries' widgets show their sanitised text fallback), HTML outputs are
 * sanitised, and a Content-Security-Policy lets only the renderer script run (pagePolicy.ts).
 */
import { existsSync } from "node:fs";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { DataError, InvalidArgumentError } from "../../src/errors.js";
import { escapeHtml } from "../../src/report/escape.js";
import { createNotebookProse } from "./notebookMarkdown.js";
import { writeFileAtomic } from "../figures/atomicWrite.js";
import { MODULE_NAME } from "../../widgets/shared/version.js";
import { contentSecurityPolicy, jsonForScript, sanitizeOutputHtml } from "./pagePolicy.js";

const STATE_MIME = "application/vnd.jupyter.widget-state+json";
const VIEW_MIME = "application/vnd.jupyter.widget-view+json";

/** Where the renderer bundle is (widgets/dist/fringekit-embed.js, from source or from dist/). */
export function rendererBundlePath(): string {
  const here = path.dirname(fileURLToPath(import.meta.url));
  const candidates = [path.resolve(here, "../../widgets/dist/fringekit-embed.js"), path.resolve(here, "../../../widgets/dist/fringekit-embed.js")];
  const found = candidates.find((file) => existsSync(file));
  if (!found) {
    throw new DataError("widgets/dist/fringekit-embed.js", "the widget renderer bundle is not built", "build it with `npx tsx widgets/build.ts` (or `npm run build:widgets`)");
  }
  return found;
}

type Output = Record<string, any>;
const text = (value: unknown) => (Array.isArray(value) ? value.join("") : String(value ?? ""));
/** The renderer's JavaScript inside <script>: `</script` would end the element early, `<!--` would start a comment state. */
const scriptSafe = (value: string) => value.replace(/<\/(script)/gi, "<\\/$1").replace(/<!--/g, "<\\!--");
/** Markdown cell source as HTML (sanitised by the caller like any other notebook HTML). */
const markdownHtml = (source: string) => `<pre>${escapeHtml(source)}</pre>`;

function renderOutput(output: Output, models: Set<string>): string {
  switch (output.output_type) {
    case "stream":
      return `<pre class="fk-stream fk-${output.name === "stderr" ? "stderr" : "stdout"}">${escapeHtml(text(output.text))}</pre>`;
    case "error":
      return `<pre class="fk-error">${escapeHtml(`${output.ename}: ${output.evalue}`)}</pre>`;
    case "display_data":
    case "execute_result": {
      const data = (output.data ?? {}) as Record<string, unknown>;
      const view = data[VIEW_MIME] as { model_id?: string; version_major?: number; version_minor?: number } | undefined;
      const fallback = data["text/html"] !== undefined ? `<div class="fk-static-fallback">${sanitizeOutputHtml(text(data["text/html"]))}</div>`
        : data["text/plain"] !== undefined ? `<pre class="fk-static-fallback">${escapeHtml(text(data["text/plain"]))}</pre>` : "";
      if (view?.model_id && models.has(view.model_id)) {
        return `<div class="fk-output">${fallback}<script type="${VIEW_MIME}">${jsonForScript({ version_major: view.version_major, version_minor: view.version_minor, model_id: view.model_id })}</script></div>`;
      }
      if (data["image/png"] !== undefined) return `<img alt="figure" src="data:image/png;base64,${escapeHtml(text(data["image/png"]).trim())}">`;
      if (data["image/svg+xml"] !== undefined) return `<img alt="figure" src="data:image/svg+xml;base64,${Buffer.from(text(data["image/svg+xml"])).toString("base64")}">`;
      return fallback;
    }
    default:
      return "";
  }
}

/**
 * The widget-state document with only fringekit's own models (`model_module` fringekit-widgets):
 * other libraries' models (HTML, Output, Image widgets…) would be drawn by a stock widget
 * manager with their own HTML and network access, so they are left out and their views fall
 * back to the output's text. Undefined when there is no state.
 */
function ownModels(document: unknown): { state: Record<string, unknown> } | undefined {
  if (typeof document !== "object" || document === null) return undefined;
  const all = (document as { state?: unknown }).state;
  if (typeof all !== "object" || all === null) return undefined;
  const own = Object.entries(all as Record<string, any>).filter(([, model]) => model?.model_module === MODULE_NAME);
  return { ...(document as object), state: Object.fromEntries(own) };
}

/**
 * The HTML page for a notebook document (parsed .ipynb, nbformat 4) with `renderer` (the
 * renderer bundle's source) inlined.
 */
export function notebookHtml(notebook: Record<string, any>, renderer: string, title = "notebook"): string {
  const state = ownModels(notebook.metadata?.widgets?.[STATE_MIME]);
  const models = new Set(Object.keys(state?.state ?? {}));
  const rendererText = scriptSafe(renderer);
  const cells = (notebook.cells ?? []) as Record<string, any>[];
  const prose = createNotebookProse(); // Markdown, math, code colours, contents (notebookMarkdown.ts)
  const language = String(notebook.metadata?.language_info?.name ?? notebook.metadata?.kernelspec?.language ?? "");
  const body = cells.map((cell) => {
    const source = text(cell.source);
    if (cell.cell_type === "markdown") return `<div class="fk-md">${sanitizeOutputHtml(prose.markdown(source))}</div>`;
    if (cell.cell_type !== "code") return "";
    const outputs = ((cell.outputs ?? []) as Output[]).map((o) => renderOutput(o, models)).join("\n");
    return `<div class="fk-cell">${prose.code(source, language)}${outputs}</div>`;
  }).join("\n");
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${contentSecurityPolicy([rendererText])}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>
body { font: 14px/1.45 system-ui, sans-serif; color: #1e293b; max-width: 1180px; margin: 24px auto; padding: 0 16px; }
.fk-cell { margin: 14px 0; }
pre.fk-code { background: #f8fafc; border-left: 3px solid #94a3b8; padding: 8px 10px; overflow-x: auto; font-size: 12.5px; }
pre.fk-stream { margin: 4px 0; font-size: 12.5px; }
pre.fk-error { color: #b91c1c; }
img { max-width: 100%; }
${prose.css()}
</style>
${state ? `<script type="${STATE_MIME}">${jsonForScript(state)}</script>` : ""}
</head><body>
${prose.tableOfContents()}${body}
<script id="fringekit-widget-renderer">${rendererText}</script>
</body></html>
`;
}

/**
 * Write an HTML export of the executed notebook `ipynbPath` to `outPath` (atomically: temporary
 * file, then rename). The notebook file is only read.
 * @throws DataError when the notebook cannot be read or the renderer bundle is missing
 */
export async function exportNotebookHtml(ipynbPath: string, outPath: string): Promise<void> {
  if (typeof ipynbPath !== "string" || !ipynbPath.endsWith(".ipynb")) throw new InvalidArgumentError("ipynbPath", ipynbPath, "a path to an .ipynb file");
  if (typeof outPath !== "string" || path.resolve(outPath) === path.resolve(ipynbPath)) throw new InvalidArgumentError("outPath", outPath, "an .html path other than the notebook");
  let notebook: Record<string, any>;
  try {
    notebook = JSON.parse(await readFile(ipynbPath, "utf8"));
  } catch (error) {
    throw new DataError(path.basename(ipynbPath), `cannot read the notebook (${(error as Error).message})`, "pass an executed .ipynb file saved by Jupyter or nbclient");
  }
  if (notebook.nbformat !== 4) throw new DataError(path.basename(ipynbPath), `nbformat ${notebook.nbformat}`, "convert it to nbformat 4 first (jupyter nbconvert --to notebook)");
  const renderer = await readFile(rendererBundlePath(), "utf8");
  const html = notebookHtml(notebook, renderer, path.basename(ipynbPath, ".ipynb"));
  await writeFileAtomic(outPath, html);
}
