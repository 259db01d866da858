// A JupyterLab notebook without the JupyterLab application: JupyterLab's own notebook component
// (@jupyterlab/notebook with the CodeMirror editor), its document context on a jupyter-server
// (@jupyterlab/services), and JupyterLab's widget manager (@jupyter-widgets/jupyterlab-manager),
// with fringekit's prebuilt lab extension loaded as JupyterLab loads a federated extension
// (its remoteEntry script, a share scope holding @jupyter-widgets/base, then the plugin activated
// with a widget registry). Bundled by test/lab/labNotebook.test.ts with esbuild; the page is
// served by the test on 127.0.0.1 beside jupyter-server (which allows the page's origin).
import "@jupyterlab/notebook/style/index.css";
import "@jupyterlab/codemirror/style/index.css";
import "@jupyter-widgets/base/css/index.css";
import "@jupyter-widgets/controls/css/widgets-base.css";
import * as base from "@jupyter-widgets/base";
import { WidgetManager } from "@jupyter-widgets/jupyterlab-manager/lib/manager.js";
import { WidgetRenderer } from "@jupyter-widgets/jupyterlab-manager/lib/renderer.js";
import { CodeMirrorEditorFactory, CodeMirrorMimeTypeService, EditorExtensionRegistry, EditorLanguageRegistry } from "@jupyterlab/codemirror";
import { Context } from "@jupyterlab/docregistry";
import { Notebook, NotebookActions, NotebookModelFactory, NotebookPanel, StaticNotebook } from "@jupyterlab/notebook";
import { RenderMimeRegistry, standardRendererFactories } from "@jupyterlab/rendermime";
import { ServerConnection, ServiceManager } from "@jupyterlab/services";
import { Widget } from "@lumino/widgets";

const WIDGET_VIEW_MIME = "application/vnd.jupyter.widget-view+json";
const params = new URLSearchParams(location.search);
const settings = ServerConnection.makeSettings({ baseUrl: params.get("server") ?? `${location.origin}/`, token: params.get("token") ?? "", appendToken: true });
const services = new ServiceManager({ serverSettings: settings });

interface Container {
  init(scope: unknown): Promise<void>;
  get(module: string): Promise<() => { default: { activate(app: unknown, registry: unknown): void } }>;
}
let fringekitPlugin: { activate(app: unknown, registry: unknown): void } | null = null;

/** Load the federated extension once, the way JupyterLab's page does (remoteEntry + share scope). */
async function loadLabExtension(name: string, remoteEntry: string): Promise<void> {
  if (fringekitPlugin) return;
  await new Promise<void>((resolve, reject) => {
    const script = Object.assign(document.createElement("script"), { src: remoteEntry, onload: () => resolve(), onerror: () => reject(new Error(`cannot load ${remoteEntry}`)) });
    document.head.appendChild(script);
  });
  const container = (window as unknown as { _JUPYTERLAB: Record<string, Container> })._JUPYTERLAB[name]!;
  await container.init({ "@jupyter-widgets/base": { [base.JUPYTER_WIDGETS_VERSION.replace(/^(\d+\.\d+)$/, "$1.0")]: { get: () => Promise.resolve(() => base), loaded: 1, from: "lab-test-page", eager: false } } });
  fringekitPlugin = (await container.get("./extension"))().default;
}

let panel: NotebookPanel | null = null;
let manager: WidgetManager | null = null;

/** Open `path` (relative to the server's root) in a notebook panel with the fringekit kernel. */
async function open(path: string, extension: { name: string; remoteEntry: string }): Promise<void> {
  await services.ready;
  await loadLabExtension(extension.name, extension.remoteEntry);
  const languages = new EditorLanguageRegistry();
  for (const language of EditorLanguageRegistry.getDefaultLanguages()) languages.addLanguage(language);
  const extensions = new EditorExtensionRegistry();
  for (const factory of EditorExtensionRegistry.getDefaultExtensions()) extensions.addExtension(factory);
  const editorServices = new CodeMirrorEditorFactory({ extensions, languages });
  const rendermime = new RenderMimeRegistry({ initialFactories: standardRendererFactories });
  const context = new Context({ manager: services, factory: new NotebookModelFactory({}), path, kernelPreference: { name: "fringekit", shouldStart: true, canStart: true } });
  const content = new Notebook({
    rendermime, contentFactory: new NotebookPanel.ContentFactory({ editorFactory: editorServices.newInlineEditor }),
    mimeTypeService: new CodeMirrorMimeTypeService(languages), notebookConfig: { ...StaticNotebook.defaultNotebookConfig, windowingMode: "none" },
  });
  panel = new NotebookPanel({ context, content });
  // JupyterLab's widget manager for this document, saving widget state into the notebook.
  manager = new WidgetManager(context, content.rendermime, { saveState: true });
  manager.register({ name: "@jupyter-widgets/base", version: base.JUPYTER_WIDGETS_VERSION, exports: base as unknown as base.ExportData });
  fringekitPlugin!.activate({}, { registerWidget: (data: base.IWidgetRegistryData) => manager!.register(data) });
  content.rendermime.addFactory({ safe: false, mimeTypes: [WIDGET_VIEW_MIME], createRenderer: (options) => new WidgetRenderer(options, manager!) }, -10);
  Widget.attach(panel, document.getElementById("notebook")!);
  await context.initialize(false);
  await panel.sessionContext.ready;
}

/** Run every cell (JupyterLab's "Run All"); resolves when the last one has finished. */
async function runAll(): Promise<boolean> {
  return NotebookActions.runAll(panel!.content, panel!.sessionContext);
}

/** Execute code in the kernel behind the page and return its text/plain result. */
async function evaluate(code: string): Promise<string> {
  const kernel = panel!.sessionContext.session!.kernel!;
  let result = "";
  const future = kernel.requestExecute({ code, store_history: false });
  future.onIOPub = (msg) => {
    const content = msg.content as { data?: Record<string, string>; text?: string; ename?: string; evalue?: string };
    if (msg.header.msg_type === "execute_result") result = content.data?.["text/plain"] ?? "";
    if (msg.header.msg_type === "stream") result += content.text ?? "";
    if (msg.header.msg_type === "error") result = `${content.ename}: ${content.evalue}`;
  };
  await future.done;
  return result;
}

/** Per code cell: its execution count and the text of its error and stream outputs (for failure messages). */
function cellReport(): { count: number | null; errors: string[]; streams: string }[] {
  const model = panel!.content.model!;
  const report = [];
  for (let i = 0; i < model.cells.length; i++) {
    const cell = model.cells.get(i).toJSON() as { cell_type: string; execution_count?: number | null; outputs?: Record<string, any>[] };
    if (cell.cell_type !== "code") continue;
    const outputs = cell.outputs ?? [];
    report.push({
      count: cell.execution_count ?? null,
      errors: outputs.filter((o) => o.output_type === "error").map((o) => `${o.ename}: ${o.evalue}`),
      streams: outputs.filter((o) => o.output_type === "stream").map((o) => [].concat(o.text).join("")).join(""),
    });
  }
  return report;
}

async function save(): Promise<void> {
  await panel!.context.save();
}

/** Close the panel and shut its kernel down. */
async function close(): Promise<void> {
  if (!panel) return;
  await panel.sessionContext.shutdown().catch(() => undefined);
  panel.dispose();
  panel = null;
  manager = null;
}

Object.assign(window, { labTest: { open, runAll, evaluate, cellReport, save, close } });
document.body.dataset.ready = "1";
