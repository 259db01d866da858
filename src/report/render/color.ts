/** Colours as figure descriptions write them (#rgb, #rrggbb, rgb(), rgba()) split into an opaque hex colour and an opacity. */

/** An sRGB colour as "#rrggbb" and its opacity 0–1. */
export interface Paint {
  hex: string;
  alpha: number;
}

const hex2 = (v: number) => Math.max(0, Math.min(255, Math.round(v))).toString(16).padStart(2, "0");

/**
 * Parse a CSS colour of the forms the builders use; "transparent", "none" and anything
 * unreadable give alpha 0 (nothing drawn) rather than a wrong colour.
 */
export function parseColor(color: unknown): Paint {
  if (typeof color !== "string") return { hex: "#000000", alpha: 0 };
  const text = color.trim().toLowerCase();
  let m = /^#([0-9a-f]{6})$/.exec(text);
  if (m) return { hex: `#${m[1]}`, alpha: 1 };
  m = /^#([0-9a-f])([0-9a-f])([0-9a-f])$/.exec(text);
  if (m) return { hex: `#${m[1]}${m[1]}${m[2]}${m[2]}${m[3]}${m[3]}`, alpha: 1 };
  m = /^rgba?\(\s*([\d.]+)\s*,\s*([\d.]+)\s*,\s*([\d.]+)\s*(?:,\s*([\d.]+)\s*)?\)$/.exec(text);
  if (m) return { hex: `#${hex2(+m[1]!)}${hex2(+m[2]!)}${hex2(+m[3]!)}`, alpha: m[4] === undefined ? 1 : Math.max(0, Math.min(1, +m[4])) };
  if (text === "white") return { hex: "#ffffff", alpha: 1 };
  if (text === "black") return { hex: "#000000", alpha: 1 };
  return { hex: "#000000", alpha: 0 };
}

/**
 * Colour at `t` (0–1) of a colour scale given as [position, colour] stops, interpolated
 * linearly in sRGB components (as plotly does for heat maps).
 */
export function scaleColor(scale: readonly (readonly [number, string])[], t: number): string {
  const x = Math.max(0, Math.min(1, t));
  for (let i = 1; i < scale.length; i++) {
    const [p1, c1] = scale[i]!;
    const [p0, c0] = scale[i - 1]!;
    if (x <= p1 || i === scale.length - 1) {
      const f = p1 > p0 ? Math.max(0, Math.min(1, (x - p0) / (p1 - p0))) : 0;
      const a = parseColor(c0).hex, b = parseColor(c1).hex;
      const part = (k: number) => parseInt(a.slice(k, k + 2), 16) * (1 - f) + parseInt(b.slice(k, k + 2), 16) * f;
      return `#${hex2(part(1))}${hex2(part(3))}${hex2(part(5))}`;
    }
  }
  return parseColor(scale[0]?.[1]).hex;
}
