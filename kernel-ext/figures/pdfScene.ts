/**
 * Vector PDF of a figure scene with PDFKit: paths as PDF paths (one per trace), text as text
 * in Liberation Sans embedded as a subset, page size the figure's physical size.
 */
import type { Scene, SceneItem, TextItem } from "../../src/report/render/scene.js";
import { SCRIPT_SCALE, SCRIPT_SHIFT } from "../../src/report/render/markup.js";
import { figureFonts } from "./fonts.js";

/** PDF points per CSS px (72 pt and 96 px per inch). */
const PT_PER_PX = 0.75;

/** The bytes of a one-page PDF of `scene` (page = widthMm × heightMm). */
export async function sceneToPdf(scene: Scene): Promise<Uint8Array> {
  const { default: PDFDocument } = await import("pdfkit");
  const fonts = figureFonts();
  const doc = new PDFDocument({
    autoFirstPage: false,
    compress: true,
    info: { Title: "fringekit figure", Producer: "fringekit", Creator: "fringekit", CreationDate: new Date(0) },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<void>((resolve, reject) => {
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve());
    doc.on("error", reject);
  });
  doc.registerFont("regular", fonts.regular);
  doc.registerFont("italic", fonts.italic);
  doc.addPage({ size: [(scene.widthMm / 25.4) * 72, (scene.heightMm / 25.4) * 72], margin: 0 });
  doc.scale(PT_PER_PX);
  doc.rect(0, 0, scene.width, scene.height).fill(scene.background);
  const draw = (item: SceneItem) => {
    if (item.type === "group") {
      doc.save();
      doc.rect(item.clip.x, item.clip.y, item.clip.width, item.clip.height).clip();
      item.items.forEach(draw);
      doc.restore();
    } else if (item.type === "path") {
      const stroke = item.stroke !== undefined && (item.strokeWidth ?? 1) > 0;
      if (!stroke && item.fill === undefined) return;
      doc.save();
      doc.path(item.d);
      if (item.fill !== undefined) doc.fillColor(item.fill, item.fillOpacity ?? 1);
      if (stroke) {
        doc.strokeColor(item.stroke!, item.strokeOpacity ?? 1).lineWidth(item.strokeWidth ?? 1);
        doc.lineCap(item.cap ?? "butt").lineJoin(item.join ?? "miter");
        // PDFKit takes a whole dash array (its typings say a number).
        if (item.dash?.length) doc.dash(item.dash as unknown as number, {}); else doc.undash();
      }
      if (item.fill !== undefined && stroke) doc.fillAndStroke();
      else if (item.fill !== undefined) doc.fill();
      else doc.stroke();
      doc.restore();
    } else {
      drawText(doc, item);
    }
  };
  scene.items.forEach(draw);
  doc.end();
  await done;
  return new Uint8Array(Buffer.concat(chunks));
}

function drawText(doc: PDFKit.PDFDocument, t: TextItem): void {
  const pieces = t.runs.map((run) => {
    const size = run.shift ? t.size * SCRIPT_SCALE : t.size;
    doc.font(run.italic ? "italic" : "regular").fontSize(size);
    return { run, size, width: doc.widthOfString(run.text) };
  });
  const total = pieces.reduce((s, p) => s + p.width, 0);
  doc.save();
  if (t.rotate) doc.rotate(t.rotate, { origin: [t.x, t.y] });
  let x = t.anchor === "middle" ? t.x - total / 2 : t.anchor === "end" ? t.x - total : t.x;
  doc.fillColor(t.color);
  for (const { run, size, width } of pieces) {
    const y = t.y + (run.shift ? SCRIPT_SHIFT[run.shift] * t.size : 0);
    doc.font(run.italic ? "italic" : "regular").fontSize(size);
    doc.text(run.text, x, y, { lineBreak: false, baseline: "alphabetic" });
    x += width;
  }
  doc.restore();
}
