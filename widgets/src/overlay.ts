/**
 * Canvas layers on a plotly figure: over it, what changes at slider speed (the model curve and
 * residuals); under it, the many data markers (one SVG element per point made plotly's first
 * draw of an 8192-point profile take ~0.5 s). Redrawing a canvas costs a few ms where a plotly
 * redraw of an 8192-point SVG figure costs hundreds. Positions come from plotly's own axis
 * mapping, so zoom and resize match.
 */

/** A plotly axis as laid out (internal fields plotly keeps on the graph div's _fullLayout). */
interface LaidOutAxis {
  _offset: number;
  _length: number;
  l2p(value: number): number;
  type: string;
}

/**
 * What to draw: x in display units, per y-axis name ("yaxis", "yaxis2"): a line, small squares
 * ("points"), or round markers as plotly draws them ("markers": `width` is the diameter in px,
 * each filled with `opacity`, so overlapping markers darken as plotly's do).
 */
export interface OverlaySeries {
  x: Float64Array;
  y: Float64Array;
  yaxis: "yaxis" | "yaxis2";
  color: string;
  style: "line" | "points" | "markers";
  width: number;
  opacity?: number;
}

/**
 * A shaded x range over the whole plotting area (both subplots), as a plotly rect shape with
 * yref "paper" draws it: `x0`, `x1` in display units, an optional outline dotted as plotly's
 * "dot" dash at 1 px.
 */
export interface OverlayBand {
  x0: number;
  x1: number;
  fill: string;
  outline?: string;
}

/**
 * Draw `bands`, then `series` onto `canvas`, sized to `plot` (the plotly graph div), each series
 * clipped to its subplot.
 */
export function drawOverlay(canvas: HTMLCanvasElement, plot: HTMLElement, series: readonly OverlaySeries[], bands: readonly OverlayBand[] = []): void {
  const layout = (plot as unknown as { _fullLayout?: Record<string, LaidOutAxis | undefined> & { _size?: { t: number; h: number } } })._fullLayout;
  const width = plot.clientWidth;
  const height = plot.clientHeight;
  const ratio = window.devicePixelRatio || 1;
  if (canvas.width !== Math.round(width * ratio) || canvas.height !== Math.round(height * ratio)) {
    canvas.width = Math.round(width * ratio);
    canvas.height = Math.round(height * ratio);
    canvas.style.width = `${width}px`;
    canvas.style.height = `${height}px`;
  }
  const ctx = canvas.getContext("2d");
  if (ctx === null) return;
  ctx.setTransform(ratio, 0, 0, ratio, 0, 0);
  ctx.clearRect(0, 0, width, height);
  const xa = layout?.xaxis;
  if (!xa || xa.type !== "linear") return;
  const area = layout?._size;
  for (const band of area ? bands : []) {
    const left = Math.max(xa._offset, xa._offset + xa.l2p(Math.min(band.x0, band.x1)));
    const right = Math.min(xa._offset + xa._length, xa._offset + xa.l2p(Math.max(band.x0, band.x1)));
    if (!(right > left)) continue;
    ctx.fillStyle = band.fill;
    ctx.fillRect(left, area!.t, right - left, area!.h);
    if (band.outline) {
      ctx.save();
      ctx.strokeStyle = band.outline;
      ctx.lineWidth = 1;
      ctx.setLineDash([3, 3]);
      ctx.strokeRect(left + 0.5, area!.t + 0.5, right - left - 1, area!.h - 1);
      ctx.restore();
    }
  }
  for (const s of series) {
    const ya = layout?.[s.yaxis];
    if (!ya || ya.type !== "linear") continue;
    ctx.save();
    ctx.beginPath();
    ctx.rect(xa._offset, ya._offset, xa._length, ya._length);
    ctx.clip();
    ctx.strokeStyle = s.color;
    ctx.fillStyle = s.color;
    ctx.lineWidth = s.width;
    ctx.lineJoin = "round";
    const n = Math.min(s.x.length, s.y.length);
    if (s.style === "line") {
      ctx.beginPath();
      let pen = false;
      for (let i = 0; i < n; i++) {
        const yi = s.y[i]!;
        if (!Number.isFinite(yi)) {
          pen = false;
          continue;
        }
        const px = xa._offset + xa.l2p(s.x[i]!);
        const py = ya._offset + ya.l2p(yi);
        if (pen) ctx.lineTo(px, py);
        else ctx.moveTo(px, py);
        pen = true;
      }
      ctx.stroke();
    } else if (s.style === "markers") {
      const radius = s.width / 2;
      ctx.globalAlpha = s.opacity ?? 1;
      for (let i = 0; i < n; i++) {
        const yi = s.y[i]!;
        if (!Number.isFinite(yi)) continue;
        ctx.beginPath();
        ctx.arc(xa._offset + xa.l2p(s.x[i]!), ya._offset + ya.l2p(yi), radius, 0, 2 * Math.PI);
        ctx.fill();
      }
    } else {
      const size = s.width;
      for (let i = 0; i < n; i++) {
        const yi = s.y[i]!;
        if (!Number.isFinite(yi)) continue;
        ctx.fillRect(xa._offset + xa.l2p(s.x[i]!) - size / 2, ya._offset + ya.l2p(yi) - size / 2, size, size);
      }
    }
    ctx.restore();
  }
}
