import { launchBrowser } from "./browser.js";
import { writeFileSync } from "node:fs";
const b = await launchBrowser(1280, 800);
try {
  writeFileSync("/tmp/wtry/h.html", `<!doctype html><html><head><meta charset=utf-8></head><body style="margin:16px;max-width:1240px"><script src="file:///work/main/widgets/dist/test-harness.js"></script></body></html>`);
  b.page.on("console", (m) => console.log("console:", m.text()));
  b.page.on("pageerror", (e) => console.log("pageerror:", e.message));
  await b.page.goto("file:///tmp/wtry/h.html");
  await b.page.waitForSelector("body[data-ready]", { state: "attached" });
  await b.page.evaluate(async () => { const fk = (window as any).fk; await fk.show("ExplorerModel", fk.b1State(8192)); });
  await b.page.waitForTimeout(1500);
  await b.page.screenshot({ path: "/tmp/wtry/explorer.png", fullPage: true });
  await b.page.setViewportSize({ width: 600, height: 800 });
  await b.page.waitForTimeout(800);
  await b.page.screenshot({ path: "/tmp/wtry/explorer-narrow.png", fullPage: true });
} finally { await b.close(); }
