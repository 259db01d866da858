// notebookHtml / exportNotebookHtml on a hostile notebook, checked in headless Chromium: no
// script from the notebook runs, no request leaves the page, widgets of other libraries are not
// rendered (their text fallback is shown), and `<!--` or `</script>` inside widget state strings
// break nothing. Policy: README "Limits and security"; CSP semantics from the W3C Content
// Security Policy Level 3 recommendation (open standard).
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { exportNotebookHtml, notebookHtml } from "../../kernel-ext/widgets/exportHtml.js";
import { buildWidgetBundles } from "../../widgets/build.js";
import { hasChromium, launchBrowser, type Browser } from "./browser.js";
import { demoWidgets } from "./demoWidgets.js";

const run = hasChromium() ? describe : describe.skip;
const VIEW = "application/vnd.jupyter.widget-view+json";
const STATE = "application/vnd.jupyter.widget-state+json";

/** Every payload sets window.__pwned (or asks the network) if it runs. */
const HOSTILE_HTML = [
  "<script>window.__pwned = 'script'</script>",
  "<img src=x onerror=\"window.__pwned = 'img-onerror'\">",
  "<svg onload=\"window.__pwned = 'svg-onload'\"><circle r=5 /></svg>",
  "<iframe src=\"javascript:parent.__pwned = 'iframe-js'\"></iframe>",
  "<a class=jslink href=\"javascript:window.__pwned = 'a-js'\">link</a>",
  "<img src=\"http://127.0.0.1:9/leak.png\">",
  "<link rel=stylesheet href=\"http://127.0.0.1:9/leak.css\">",
  "<style>@import url(http://127.0.0.1:9/leak2.css); body { background: url(http://127.0.0.1:9/bg.png) }</style>",
  "<div style=\"background-image: url(http://127.0.0.1:9/div.png)\">styled</div>",
  "<meta http-equiv=refresh content=\"0; url=http://127.0.0.1:9/refresh\">",
  "<object data=\"http://127.0.0.1:9/obj\"></object><embed src=\"http://127.0.0.1:9/embed\">",
  "<form action=\"http://127.0.0.1:9/form\"><button class=formbutton>go</button></form>",
  "<base href=\"http://127.0.0.1:9/\">",
  "<math><mtext><table><mglyph><style><img src=x onerror=\"window.__pwned = 'mxss'\"></style></mglyph></table></mtext></math>",
  "<table><tr><td>a safe table cell</td></tr></table>",
  "<!-- an unclosed comment swallows the rest of the page",
];

const HOSTILE_STRING = "<!-- </script><script>window.__pwned = 'state'</script> \u2028 <\/script>";

function hostileNotebook(widgets: ReturnType<typeof demoWidgets>): Record<string, any> {
  const state = JSON.parse(JSON.stringify(widgets.state)) as { state: Record<string, any> };
  // A fringekit model whose strings hold comment and end-tag openers (item 7).
  state.state[widgets.ids.explorer]!.state.title = `Explorer ${HOSTILE_STRING}`;
  // Models of other widget libraries: rendered by a stock widget manager, never by this export.
  state.state["foreign-html"] = { model_name: "HTMLModel", model_module: "@jupyter-widgets/controls", model_module_version: "2.0.0",
    state: { value: "<img src=x onerror=\"window.__pwned = 'html-widget'\"><img src=\"http://127.0.0.1:9/widget.png\">" } };
  state.state["foreign-output"] = { model_name: "OutputModel", model_module: "@jupyter-widgets/output", model_module_version: "1.0.0",
    state: { outputs: [{ output_type: "display_data", data: { "text/html": "<script>window.__pwned = 'output-widget'</script>" }, metadata: {} }] } };
  // A fringekit model whose buffer path walks into Object.prototype (item 8, page side).
  const polluter = JSON.parse(JSON.stringify(state.state[widgets.ids.comparison]));
  polluter.buffers.push({ path: ["__proto__", "polluted"], data: "AAAAAA==", encoding: "base64" });
  state.state["fk-polluter"] = polluter;
  state.state["foreign-lib"] = { model_name: "EvilModel", model_module: "evil-widgets", model_module_version: "1.0.0", state: {} };
  const view = (id: string, html?: string) => ({ output_type: "display_data", metadata: {}, data: {
    [VIEW]: { version_major: 2, version_minor: 0, model_id: id }, "text/plain": `${id} fallback`, ...(html ? { "text/html": html } : {}),
  } });
  const cells: Record<string, any>[] = [
    { cell_type: "markdown", metadata: {}, source: "# Hostile </pre><script>window.__pwned = 'markdown'</script>" },
    ...Object.entries(widgets.ids).map(([kind, id]) => ({ cell_type: "code", metadata: {}, source: `// ${kind}`, outputs: [view(id)] })),
    { cell_type: "code", metadata: {}, source: "// foreign widgets", outputs: [
      view("foreign-html", "<b>html widget fallback</b><img src=x onerror=\"window.__pwned = 'fallback'\">"),
      view("foreign-output"), view("foreign-lib"),
    ] },
    { cell_type: "code", metadata: {}, source: "// hostile outputs", outputs: [
      ...HOSTILE_HTML.map((html) => ({ output_type: "display_data", metadata: {}, data: { "text/html": html } })),
      { output_type: "execute_result", metadata: {}, data: { "image/svg+xml": "<svg xmlns='http://www.w3.org/2000/svg' onload='window.__pwned=1'><script>window.__pwned = 'svg-image'</script></svg>" } },
      { output_type: "stream", name: "stdout\" onmouseover=\"window.__pwned='stream'", text: "<script>window.__pwned = 'stream'</script>" },
      { output_type: "error", ename: "<script>x</script>", evalue: "<img src=x onerror=alert(1)>", traceback: [] },
    ] },
    { cell_type: "code", metadata: {}, source: "// the last cell", outputs: [{ output_type: "display_data", metadata: {}, data: { "text/html": "<p class=last-cell>still here</p>" } }] },
  ];
  return { nbformat: 4, nbformat_minor: 5, metadata: { widgets: { [STATE]: state } }, cells };
}

run("exportNotebookHtml(hostile.ipynb, out.html)", () => {
  let dir = "";
  let browser: Browser;
  let html = "";
  const requests: string[] = [];
  const widgets = demoWidgets(256);

  beforeAll(async () => {
    await buildWidgetBundles();
    dir = mkdtempSync(path.join(os.tmpdir(), "fringekit-hostile-"));
    writeFileSync(path.join(dir, "hostile.ipynb"), JSON.stringify(hostileNotebook(widgets)));
    await exportNotebookHtml(path.join(dir, "hostile.ipynb"), path.join(dir, "hostile.html"));
    html = readFileSync(path.join(dir, "hostile.html"), "utf8");
    browser = await launchBrowser(1280, 800);
    browser.context.on("request", (request) => {
      const url = request.url();
      if (!url.startsWith("file:") && !url.startsWith("blob:") && !url.startsWith("data:")) requests.push(url);
    });
    await browser.context.route("**/*", (route) => {
      const url = route.request().url();
      if (url.startsWith("file:") || url.startsWith("blob:") || url.startsWith("data:")) return route.continue();
      return route.abort();
    });
  }, 300_000);
  afterAll(async () => {
    await browser?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it("renders fringekit's four widgets, runs no notebook script and sends no request", async () => {
    const page = browser.page;
    const console: string[] = [];
    page.on("console", (m) => console.push(m.text()));
    page.on("pageerror", (e) => console.push(e.message));
    await page.goto(pathToFileURL(path.join(dir, "hostile.html")).href, { waitUntil: "commit", timeout: 90_000 });
    await page.waitForSelector("body[data-widgets-rendered='4']", { state: "attached", timeout: 120_000 })
      .catch((error) => { throw new Error(`${error}\npage said: ${console.join("\n").slice(0, 2000)}`); });
    await page.click("a.jslink", { timeout: 2000 }).catch(() => undefined);
    await page.click("button.formbutton", { timeout: 2000 }).catch(() => undefined);
    await page.waitForTimeout(1000);
    expect(page.url()).toMatch(/^file:.*hostile\.html$/);
    expect(await page.evaluate(() => (window as any).__pwned)).toBeUndefined();
    expect(await page.evaluate(() => [({} as any).polluted === undefined, String({})])).toEqual([true, "[object Object]"]);
    expect(requests).toEqual([]);
    expect(await page.$$eval(".fk-root", (els) => els.length)).toBe(4);
    // The unclosed comment swallowed nothing; the safe table survived sanitising.
    expect(await page.textContent(".last-cell")).toBe("still here");
    expect(html).toContain("a safe table cell");
    // The explorer shows its title with the hostile characters as text.
    expect(await page.textContent("body")).toContain("Explorer <!-- </script>");
  }, 180_000);

  it("shows other libraries' widgets as their sanitised text fallback and drops their models", () => {
    expect(html).toContain("html widget fallback");
    expect(html).toContain("foreign-output fallback");
    const state = JSON.parse(html.match(/<script type="application\/vnd\.jupyter\.widget-state\+json">([^]*?)<\/script>/)![1]!);
    expect(Object.keys(state.state).sort()).toEqual([...Object.values(widgets.ids), "fk-polluter"].sort());
    const page = html.slice(html.indexOf("<body>"), html.indexOf('<script id="fringekit-widget-renderer">')); // the renderer bundle is ours
    // Inside tags (escaped text such as "&lt;img onerror" in an error line is harmless text).
    expect(page.match(/<[^<>]*\son\w+\s*=|<[^<>]*javascript:|<(iframe|object|embed|base|style|link)\b|<meta http-equiv="?refresh/gi)).toBeNull();
  });

  it("sets a Content-Security-Policy with no network and the renderer allowed by its hash only", () => {
    const csp = html.match(/<meta http-equiv="Content-Security-Policy" content="([^"]+)">/)?.[1];
    expect(csp).toBeDefined();
    expect(csp).toMatch(/default-src 'none'/);
    expect(csp).toMatch(/script-src 'sha256-[A-Za-z0-9+/=]+'/);
    expect(csp).not.toMatch(/script-src[^;]*unsafe|https?:|\*/);
    expect(html.indexOf("Content-Security-Policy")).toBeLessThan(html.indexOf("<script"));
  });
});

describe("notebookHtml(notebook, renderer)", () => {
  it("notebookHtml(state with <!-- and </script>) embeds state that parses back to the same object", () => {
    const state = { version_major: 2, version_minor: 0, state: { a: { model_name: "ExplorerModel", model_module: "fringekit-widgets", model_module_version: "0.1.0", state: { title: HOSTILE_STRING } } } };
    const page = notebookHtml({ nbformat: 4, metadata: { widgets: { [STATE]: state } }, cells: [] }, "/* renderer */");
    const body = page.match(/<script type="application\/vnd\.jupyter\.widget-state\+json">([^]*?)<\/script>/)![1]!;
    expect(body).not.toMatch(/<!--|<\/script|<script/i);
    expect(JSON.parse(body)).toEqual(state);
  });
});
