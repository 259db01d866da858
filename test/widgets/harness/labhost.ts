// Stand-in for JupyterLab when loading the prebuilt extension: provides @jupyter-widgets/base in
// a module-federation share scope, loads the extension's remoteEntry, activates its plugin with a
// widget registry, and renders a widget through the registered module with the HTML manager.
import * as base from "@jupyter-widgets/base";
import { HTMLManager } from "@jupyter-widgets/html-manager/lib/htmlmanager.js";

const BASE_VERSION = "6.0.12";

interface Container {
  init(scope: unknown): Promise<void>;
  get(module: string): Promise<() => { default: { id: string; requires: unknown[]; activate(app: unknown, registry: unknown): void } }>;
}

async function loadExtension(remoteEntryUrl: string, name: string): Promise<Record<string, unknown>> {
  await new Promise<void>((resolve, reject) => {
    const script = Object.assign(document.createElement("script"), { src: remoteEntryUrl, onload: () => resolve(), onerror: () => reject(new Error(`cannot load ${remoteEntryUrl}`)) });
    document.head.appendChild(script);
  });
  const container = (window as unknown as { _JUPYTERLAB: Record<string, Container> })._JUPYTERLAB[name]!;
  await container.init({ "@jupyter-widgets/base": { [BASE_VERSION]: { get: () => Promise.resolve(() => base), loaded: 1, from: "test-host", eager: false } } });
  const plugin = (await container.get("./extension"))().default;
  const registered: { name: string; version: string; exports: Record<string, unknown> }[] = [];
  plugin.activate({}, { registerWidget: (data: (typeof registered)[number]) => registered.push(data) });
  return {
    id: plugin.id,
    sameRegistryToken: plugin.requires[0] === base.IJupyterWidgetRegistry,
    registered: registered.map((r) => ({ name: r.name, version: r.version, exports: Object.keys(r.exports).sort() })),
    exports: registered[0]?.exports,
  };
}

/** Render an explorer with simulated-looking data through the federated module's classes. */
async function renderThrough(exports: Record<string, unknown>, name: string, version: string): Promise<boolean> {
  const manager = new HTMLManager({ loader: async (m: string) => { if (m === name) return exports; throw new Error(`no module ${m}`); } });
  const x = Float64Array.from({ length: 256 }, (_, i) => (i - 128) * 40e-6);
  const y = x.map((v) => 1000 * (1 + Math.cos((2 * Math.PI * v) / 1.2e-3)) + 50);
  const wire = (data: Float64Array) => ({ dtype: "float64", shape: [data.length], buffer: new DataView(data.buffer) });
  const model = await manager.new_model({ model_name: "ExplorerModel", model_module: name, model_module_version: version, model_id: "lab1" },
    { x: wire(x), y: wire(y), model_id: "two-slit", counts: true });
  const host = document.body.appendChild(document.createElement("div"));
  await manager.display_view(await manager.create_view(model), host);
  return host.querySelector(".fk-root input[type=range]") !== null;
}

Object.assign(window, { labhost: { loadExtension, renderThrough } });
document.body.dataset.ready = "1";
