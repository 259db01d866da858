/**
 * The widget manager of pages without a kernel (offline HTML exports, test pages): only
 * fringekit's own widget module, no comms. The stock HTML manager also bundles the standard
 * controls (ipywidgets 7 and 8), output areas and a MIME renderer registry, about half of the
 * renderer's script, none of which a fringekit page draws.
 */
import type { WidgetModel, WidgetView } from "@jupyter-widgets/base";
import { ManagerBase } from "@jupyter-widgets/base-manager";
import { Widget } from "@lumino/widgets";

/** Resolves a widget module by name (and semver range) to its classes. */
export type ModuleLoader = (name: string, version: string) => Promise<Record<string, unknown>>;

/** A comm that sends nowhere: the page has no kernel. */
const noComm = {
  on_close: () => undefined,
  on_msg: () => undefined,
  close: () => undefined,
};

/** Widget manager for kernel-less pages: models from saved state, views attached into the page. */
export class PageWidgetManager extends ManagerBase {
  constructor(private readonly loader: ModuleLoader) {
    super();
  }

  /** Attach `view` (a created view or its promise) into `el`, as the HTML manager does. */
  async display_view(view: Promise<WidgetView> | WidgetView, el: HTMLElement): Promise<void> {
    const shown = (await view) as WidgetView & { luminoWidget: Widget };
    Widget.attach(shown.luminoWidget, el);
  }

  /**
   * Text of HTML-formatted control descriptions, escaped: fringekit's widgets have none, and a
   * foreign one shows as text (the stock manager's HTML sanitiser is not in the page).
   */
  override inline_sanitize(source: string): string {
    return source.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
  }

  protected async loadClass(className: string, moduleName: string, moduleVersion: string): Promise<typeof WidgetModel | typeof WidgetView> {
    const module = await this.loader(moduleName, moduleVersion);
    const found = module[className];
    if (typeof found !== "function") throw new Error(`class ${className} not found in widget module ${moduleName}@${moduleVersion}`);
    return found as typeof WidgetModel | typeof WidgetView;
  }

  protected _get_comm_info(): Promise<{}> {
    return Promise.resolve({});
  }

  protected _create_comm(): Promise<any> {
    return Promise.resolve(noComm);
  }
}
