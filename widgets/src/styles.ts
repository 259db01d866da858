/**
 * The widgets' stylesheet, injected once per document. Palette and layout are fringekit's own:
 * ink-blue text, a burnt-orange model line, teal for the fit window, slate for residuals.
 */

/** Colours shared by the figures and the controls. */
export const palette = {
  ink: "#1e293b",
  muted: "#64748b",
  data: "#334155",
  model: "#c2410c",
  fit: "#0f766e",
  residual: "#475569",
  masked: "#cbd5e1",
  windowShade: "rgba(15, 118, 110, 0.07)",
  maskShade: "rgba(100, 116, 139, 0.22)",
  band: "rgba(15, 118, 110, 0.18)",
  series: ["#c2410c", "#0f766e", "#6d28d9", "#a16207", "#be185d", "#1d4ed8"],
} as const;

const css = `
.fk-root { container-type: inline-size; font: 13px/1.4 system-ui, -apple-system, "Segoe UI", sans-serif;
  color: ${palette.ink}; border: 1px solid #e2e8f0; border-radius: 6px; background: #fff; padding: 8px 10px; box-sizing: border-box; width: 100%; }
.fk-root * { box-sizing: border-box; }
.fk-head { display: flex; flex-wrap: wrap; align-items: center; gap: 6px 10px; margin-bottom: 6px; }
.fk-title { font-weight: 600; font-size: 14px; margin-right: auto; }
.fk-head label { color: ${palette.muted}; display: inline-flex; align-items: center; gap: 4px; }
.fk-root select { max-width: 11em; }
.fk-root select, .fk-root input[type=number], .fk-root input[type=text] { font: inherit; padding: 2px 4px; border: 1px solid #cbd5e1; border-radius: 4px; background: #fff; color: inherit; }
.fk-root button { font: inherit; padding: 3px 10px; border: 1px solid #94a3b8; border-radius: 4px; background: #f8fafc; color: inherit; cursor: pointer; }
.fk-root button:hover { background: #f1f5f9; }
.fk-root button:focus-visible, .fk-root input:focus-visible, .fk-root select:focus-visible { outline: 2px solid ${palette.fit}; outline-offset: 1px; }
.fk-root button.fk-primary { background: ${palette.fit}; border-color: ${palette.fit}; color: #fff; font-weight: 600; }
.fk-root button.fk-primary:hover { background: #115e59; }
.fk-root button:disabled { opacity: 0.5; cursor: default; }
.fk-seg { display: inline-flex; border: 1px solid #94a3b8; border-radius: 4px; overflow: hidden; }
.fk-seg button { border: none; border-radius: 0; padding: 3px 8px; }
.fk-seg button[aria-pressed=true] { background: ${palette.ink}; color: #fff; }
.fk-body { display: grid; grid-template-columns: minmax(0, 1fr) 350px; gap: 10px; }
.fk-body.fk-wide-side { grid-template-columns: minmax(0, 1fr) 420px; }
@container (max-width: 760px) { .fk-body, .fk-body.fk-wide-side { grid-template-columns: minmax(0, 1fr); } }
.fk-plot { min-height: 420px; width: 100%; }
.fk-plotwrap { position: relative; min-width: 0; }
.fk-overlay, .fk-datalayer { position: absolute; left: 0; top: 0; pointer-events: none; }
.fk-plotwrap > .fk-plot { position: relative; }
.fk-side { display: flex; flex-direction: column; gap: 8px; min-width: 0; }
.fk-section { border-top: 1px solid #e2e8f0; padding-top: 6px; }
.fk-section h4 { margin: 0 0 4px; font-size: 12px; text-transform: uppercase; letter-spacing: 0.04em; color: ${palette.muted}; font-weight: 600; }
.fk-param { display: grid; grid-template-columns: 112px minmax(60px, 1fr) 84px 22px; gap: 2px 6px; align-items: center; padding: 2px 0; }
.fk-param .fk-name { font-weight: 500; overflow: hidden; text-overflow: ellipsis; white-space: nowrap; }
.fk-param .fk-unit { color: ${palette.muted}; font-size: 11px; }
.fk-param input[type=range] { width: 100%; accent-color: ${palette.model}; margin: 0; }
.fk-param input[type=number] { width: 100%; text-align: right; }
.fk-param input[type=checkbox] { accent-color: ${palette.ink}; margin: 0; }
.fk-param.fk-fixed .fk-name { color: ${palette.muted}; }
.fk-bounds { grid-column: 2 / 4; display: none; gap: 4px; font-size: 11px; color: ${palette.muted}; }
.fk-param.fk-open .fk-bounds { display: flex; }
.fk-bounds input { width: 50% !important; }
.fk-param-head { display: grid; grid-template-columns: 112px minmax(60px, 1fr) 84px 22px; gap: 6px; font-size: 11px; color: ${palette.muted}; }
.fk-progress { height: 4px; background: #e2e8f0; border-radius: 2px; overflow: hidden; }
.fk-progress > div { height: 100%; background: ${palette.fit}; width: 0; transition: width 0.1s; }
.fk-status { font-size: 12px; color: ${palette.muted}; min-height: 1.4em; }
.fk-status.fk-bad { color: #b91c1c; }
.fk-export-error { font-size: 12px; color: #b91c1c; }
.fk-export-error:empty { display: none; }
table.fk-table { border-collapse: collapse; width: 100%; font-size: 12px; font-variant-numeric: tabular-nums; }
table.fk-table th, table.fk-table td { padding: 2px 6px; text-align: right; border-bottom: 1px solid #f1f5f9; white-space: nowrap; }
table.fk-table th:first-child, table.fk-table td:first-child { text-align: left; }
table.fk-table th { color: ${palette.muted}; font-weight: 600; }
table.fk-table tr.fk-best td { font-weight: 600; }
.fk-warn { color: #92400e; background: #fffbeb; border-left: 3px solid #d97706; padding: 3px 6px; font-size: 12px; margin: 2px 0; }
.fk-verdict { padding: 6px 8px; font-size: 12.5px; background: #f0fdfa; border-left: 3px solid ${palette.fit}; border-radius: 2px; }

.fk-swatch { display: inline-block; width: 10px; height: 10px; border-radius: 2px; margin-right: 5px; vertical-align: -1px; }
.fk-scroll { overflow-x: auto; }
`;

/** Add the stylesheet to `doc` once. */
export function ensureStyles(doc: Document = document): void {
  if (doc.getElementById("fringekit-widget-styles")) return;
  const style = doc.createElement("style");
  style.id = "fringekit-widget-styles";
  style.textContent = css;
  doc.head.appendChild(style);
}
