// Live test page: @jupyterlab/services talking to a Jupyter server, the ipywidgets HTML manager
// receiving the kernel's widget comms, and a loader that resolves fringekit's widget module.
import { KernelManager, ServerConnection, type Kernel, type KernelMessage } from "@jupyterlab/services";
import { shims } from "@jupyter-widgets/base";
import { HTMLManager } from "@jupyter-widgets/html-manager/lib/htmlmanager.js";
import * as widgetModule from "../../../widgets/src/index.js";
import { registerPhysicsModels } from "../../../widgets/src/registerPhysics.js";

registerPhysicsModels();

const VIEW_MIME = "application/vnd.jupyter.widget-view+json";
let kernel: Kernel.IKernelConnection | null = null;
let kernels: KernelManager | null = null;
const manager = new HTMLManager({
  loader: async (name: string) => {
    if (name === widgetModule.MODULE_NAME) return widgetModule;
    throw new Error(`live page: no module ${name}`);
  },
});
const views: unknown[] = [];

/** Connect to the server and start a kernel of `kernelName`; widget comms go to the manager. */
async function connect(baseUrl: string, token: string, kernelName: string): Promise<string> {
  const serverSettings = ServerConnection.makeSettings({ baseUrl, wsUrl: baseUrl.replace(/^http/, "ws"), token, appendToken: true });
  kernels = new KernelManager({ serverSettings });
  await kernels.ready;
  kernel = await kernels.startNew({ name: kernelName });
  kernel.registerCommTarget("jupyter.widget", async (comm, msg) => {
    await manager.handle_comm_open(new shims.services.Comm(comm), msg as KernelMessage.ICommOpenMsg);
  });
  return kernel.id;
}

/** Output of one executed cell: text, errors, and how many widget views it showed. */
interface CellRun {
  status: string;
  text: string[];
  error: string | null;
  widgets: string[];
}

/** Execute `code`; widget views in its output are rendered into a new output div. */
async function run(code: string): Promise<CellRun> {
  if (!kernel) throw new Error("live page: not connected");
  const out: CellRun = { status: "", text: [], error: null, widgets: [] };
  const area = document.body.appendChild(Object.assign(document.createElement("div"), { className: "cell-output" }));
  const pending: Promise<void>[] = [];
  const future = kernel.requestExecute({ code, stop_on_error: true });
  future.onIOPub = (msg) => {
    const type = msg.header.msg_type;
    const content = msg.content as Record<string, any>;
    if (type === "stream") out.text.push(content.text);
    else if (type === "error") out.error = `${content.ename}: ${content.evalue}`;
    else if (type === "display_data" || type === "execute_result") {
      const data = content.data as Record<string, any>;
      if (data[VIEW_MIME]) {
        const id = data[VIEW_MIME].model_id as string;
        out.widgets.push(id);
        const host = area.appendChild(Object.assign(document.createElement("div"), { id: `view-${id}` }));
        pending.push((async () => {
          const model = await manager.get_model(id);
          const view = await manager.create_view(model);
          views.push(view);
          await manager.display_view(view, host);
        })());
      } else if (data["text/plain"]) out.text.push(String(data["text/plain"]));
    }
  };
  const reply = await future.done;
  await Promise.all(pending);
  out.status = String((reply.content as { status: string }).status);
  return out;
}

/** Shut the kernel down (the test also stops the server). */
async function shutdown(): Promise<void> {
  await kernel?.shutdown().catch(() => undefined);
  kernels?.dispose();
}

Object.assign(window, { live: { connect, run, shutdown, manager, views } });
document.body.dataset.ready = "1";
