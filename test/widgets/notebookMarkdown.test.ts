// The prose of the offline notebook page: Markdown (CommonMark), TeX math (KaTeX, offline),
// code colours and a table of contents; then a demo notebook's page in Chromium, with no
// network, showing rendered headings, the laser-safety quote and typeset math.
import { readFileSync } from "node:fs";

import path from "node:path";
import { mkdirSync } from "node:fs";
import { decode } from "fast-png";
import pixelmatch from "pixelmatch";
import { describe, expect, it } from "vitest";
import { notebookHtml } from "../../kernel-ext/widgets/exportHtml.js";
import { createNotebookProse, katexStylesheetFor } from "../../kernel-ext/widgets/notebookMarkdown.js";
import { repoRoot } from "../kernel/helpers.js";
import { hasChromium, launchBrowser } from "./browser.js";

describe("createNotebookProse().markdown(source)", () => {
  it("renders CommonMark: headings with ids, emphasis, strong, block quotes, tables", () => {
    const prose = createNotebookProse();
    // Expected HTML shapes: CommonMark spec 0.31 (ATX headings, emphasis, block quotes); GFM tables.
    const html = prose.markdown("# 1 · First fit\n\n> **Laser safety.** Never look into the beam.\n\nWe test *source B*.\n\n| a | b |\n|---|---|\n| 1 | 2 |\n");
    expect(html).toContain('<h1 id="fk-h-1-first-fit">1 · First fit</h1>');
    expect(html).toContain("<blockquote>\n<p><strong>Laser safety.</strong> Never look into the beam.</p>\n</blockquote>");
    expect(html).toContain("<em>source B</em>");
    expect(html).toContain("<td>1</td>");
    expect(html).not.toContain("# 1");
  });

  it("typesets $…$ and $$…$$ with KaTeX and leaves prices and escaped dollars as text", () => {
    const prose = createNotebookProse();
    expect(prose.css()).not.toContain("KaTeX_Main"); // no math yet: no fonts carried
    const inline = prose.markdown("visibility $V = \\frac{I_{max}-I_{min}}{I_{max}+I_{min}}$ here");
    expect(inline).toMatch(/<span class="katex">.*<span class="mfrac">/s);
    const display = prose.markdown("$$\nl_c = \\frac{\\lambda^2}{\\Delta\\lambda}\n$$\n");
    expect(display).toContain('<span class="katex-display">');
    expect(prose.markdown("costs $5 and $10 each")).toBe("<p>costs $5 and $10 each</p>\n");
    // A TeX error shows the source in colour instead of breaking the page (KaTeX throwOnError: false).
    expect(prose.markdown("$\\frac{1}{$")).toContain('class="katex-error"');
    const css = prose.css();
    expect(css).toContain("data:font/woff2;base64,");
    expect(css).not.toMatch(/url\(fonts\//);
  });

  it("css() carries only the KaTeX font faces the typeset math uses", () => {
    // Which class draws in which face is KaTeX's own stylesheet (katex.min.css): .mathnormal is
    // KaTeX_Math italic, .mathfrak KaTeX_Fraktur, .textbf bold, .op-symbol.large-op KaTeX_Size2.
    const faces = (css: string) => [...css.matchAll(/@font-face\{[^}]*font-family:"?(KaTeX_\w+)"?;font-style:(\w+);font-weight:(\d+)/g)].map((m) => `${m[1]} ${m[2]} ${m[3]}`).sort();
    const plain = createNotebookProse();
    plain.markdown("visibility $V = \\frac{I_{max}-I_{min}}{I_{max}+I_{min}}$");
    expect(faces(plain.css())).toEqual(["KaTeX_Main normal 400", "KaTeX_Math italic 400"]);
    const more = createNotebookProse();
    more.markdown("$\\mathfrak{g}$ and $\\textbf{B}$\n\n$$\\sum_{n=0}^{\\infty} x^n$$\n");
    const carried = faces(more.css());
    expect(carried).toEqual(expect.arrayContaining(["KaTeX_Fraktur normal 400", "KaTeX_Main normal 700", "KaTeX_Size2 normal 400"]));
    expect(carried).not.toContain("KaTeX_Script normal 400");
    // Every face of KaTeX's stylesheet is there when every class is.
    const allClasses = new Set([...katexStylesheetFor(new Set()).matchAll(/\.([\w-]+)/g)].map((m) => m[1]!));
    expect(faces(katexStylesheetFor(allClasses))).toHaveLength(20);
  });

  it("emits no script: raw HTML is text, javascript: links and KaTeX \\href are refused", () => {
    const prose = createNotebookProse();
    const html = prose.markdown('<script>alert(1)</script>\n\n<img src=x onerror="alert(1)">\n\n[click](javascript:alert(1))\n\n$\\href{javascript:alert(1)}{x}$');
    expect(html).not.toMatch(/<script|<img|href="javascript/i);
    expect(html).toContain("&lt;script&gt;");
  });
});

describe("createNotebookProse().code(source, language) and tableOfContents()", () => {
  it("colours TypeScript with highlight.js classes and escapes unknown languages", () => {
    const prose = createNotebookProse();
    const html = prose.code('const fit = fitProfile(p, m); // "x" < 1', "typescript");
    expect(html).toMatch(/^<pre class="fk-code"><code class="hljs language-typescript">/);
    expect(html).toContain('<span class="hljs-keyword">const</span>');
    expect(html).toContain('<span class="hljs-comment">// &quot;x&quot; &lt; 1</span>');
    expect(prose.code("a < b", "")).toBe('<pre class="fk-code"><code>a &lt; b</code></pre>');
  });

  it("lists the headings of levels 1-3 once a notebook has four, with unique ids", () => {
    const prose = createNotebookProse();
    prose.markdown("# A\n## The data\n");
    expect(prose.tableOfContents()).toBe("");
    prose.markdown("## The data\n### Deep\n#### Deeper\n");
    const toc = prose.tableOfContents();
    expect(prose.headings().map((h) => h.id)).toEqual(["fk-h-a", "fk-h-the-data", "fk-h-the-data-2", "fk-h-deep", "fk-h-deeper"]);
    expect(toc.match(/<li /g)).toHaveLength(4);
    expect(toc).toContain('<a href="#fk-h-the-data-2">The data</a>');
  });
});

const why = !hasChromium() ? "no /usr/bin/chromium" : undefined;
if (why) console.warn(`test/widgets/notebookMarkdown: browser check skipped, ${why}`);

describe.skipIf(why)("notebookHtml(demo notebook) in Chromium", () => {
  it("math looks the same with only the fonts it uses as with all of KaTeX's fonts", async () => {
    const prose = createNotebookProse();
    const body = prose.markdown("Visibility $V = \\frac{I_{max}-I_{min}}{I_{max}+I_{min}}$, $\\mathbf{E} = \\boldsymbol{\\alpha}$, $\\textbf{b}$ " +
      "$\\textit{i}$ $\\mathbb{R}$ $\\mathfrak{g}$ $\\mathcal{L}$ $\\mathsf{S}$ $\\mathtt{t}$\n\n" +
      "$$\\left(\\int_0^\\infty \\frac{\\lambda^2}{\\Delta\\lambda}\\,d\\lambda\\right)^2 = \\sum_{n=0}^{\\infty} \\prod_k \\sqrt{x_k}$$\n");
    const used = prose.css();
    const allClasses = new Set([...katexStylesheetFor(new Set()).matchAll(/\.([\w-]+)/g)].map((m) => m[1]!));
    const all = createNotebookProse().css() + katexStylesheetFor(allClasses); // the prose CSS alone (no math yet) and every face
    expect(all.length).toBeGreaterThan(used.length);
    const browser = await launchBrowser(1000, 400);
    try {
      const shots = [];
      for (const css of [used, all]) {
        await browser.page.setContent(`<!doctype html><meta charset="utf-8"><style>body { font: 16px sans-serif; } ${css}</style><div class="fk-md">${body}</div>`, { waitUntil: "load" });
        await browser.page.evaluate(() => document.fonts.ready);
        shots.push(decode(await browser.page.screenshot()));
      }
      const rgba = (image: ReturnType<typeof decode>) => Uint8Array.from({ length: image.width * image.height * 4 }, (_, i) =>
        i % 4 === 3 ? 255 : Number(image.data[Math.floor(i / 4) * image.channels + (i % 4)]));
      expect(pixelmatch(rgba(shots[0]!), rgba(shots[1]!), undefined, shots[0]!.width, shots[0]!.height, { threshold: 0.05 })).toBe(0);
    } finally {
      await browser.close();
    }
  });

  it("shows rendered Markdown, typeset math in KaTeX fonts, coloured code and the contents, with no network", async () => {
    const notebook = JSON.parse(readFileSync(path.join(repoRoot, "notebooks-demo/01-first-fit.ipynb"), "utf8"));
    // One extra cell with TeX, as a notebook author would write it.
    notebook.cells.splice(2, 0, { cell_type: "markdown", metadata: {}, source: "The fringe term is $V\\cos(2\\pi d s/\\lambda + \\varphi)$; the coherence length\n\n$$l_c = \\frac{\\lambda^2}{\\Delta\\lambda}$$\n" });
    const html = notebookHtml(notebook, "/* no widgets in this check */", "01-first-fit");
    expect(html).not.toMatch(/<script(?![^>]*(application\/vnd\.jupyter|id="fringekit-widget-renderer"))/);
    const browser = await launchBrowser(1100, 900);
    const requests: string[] = [];
    try {
      const { page } = browser;
      page.on("request", (request) => { if (!request.url().startsWith("data:") && request.url() !== "about:blank") requests.push(request.url()); });
      await page.setContent(html, { waitUntil: "load" });
      await page.evaluate(() => document.fonts.ready);
      const facts = await page.evaluate(() => ({
        h1: document.querySelector(".fk-md h1")?.textContent,
        quote: document.querySelector(".fk-md blockquote strong")?.textContent,
        tocLinks: document.querySelectorAll("nav.fk-toc a").length,
        mathWidth: (document.querySelector(".katex-display") as HTMLElement | null)?.getBoundingClientRect().width ?? 0,
        katexFont: document.fonts.check("16px KaTeX_Main") && [...document.fonts].some((f) => f.family.includes("KaTeX_Math") && f.status === "loaded"),
        keywordColour: getComputedStyle(document.querySelector("pre.fk-code .hljs-keyword")!).color,
      }));
      expect(facts.h1).toBe("1 · First fit: a camera line through slit pair A");
      expect(facts.quote).toBe("Laser safety.");
      expect(facts.tocLinks).toBeGreaterThanOrEqual(6);
      expect(facts.mathWidth).toBeGreaterThan(40);
      expect(facts.katexFont).toBe(true);
      expect(facts.keywordColour).toBe("rgb(20, 61, 115)"); // navy #143d73 of our palette
      expect(requests).toEqual([]);
      const shots = path.join(repoRoot, "test/widgets/__output__");
      mkdirSync(shots, { recursive: true });
      await page.screenshot({ path: path.join(shots, "notebook-prose.png"), fullPage: false });
    } finally {
      await browser.close();
    }
  });
});

