/**
 * PNG from the figure SVG with resvg (@resvg/resvg-js, its platform binary ships in the npm
 * package), at a chosen resolution, fonts from figureFonts(); the dpi is recorded in pHYs.
 */
import { figureFonts } from "./fonts.js";
import { setPngDpi } from "../../src/report/render/pngDensity.js";

/**
 * Rasterise `svg` (sized in mm) to PNG bytes at `dpi`: width = widthMm / 25.4 × dpi pixels.
 * @param widthMm physical width of the figure (mm)
 */
export async function svgToPng(svg: string, widthMm: number, dpi: number): Promise<Uint8Array> {
  const { renderAsync } = await import("@resvg/resvg-js");
  const fonts = figureFonts();
  // renderAsync draws on a worker thread, so a PDF can be written meanwhile.
  const image = await renderAsync(svg, {
    fitTo: { mode: "width", value: Math.round((widthMm / 25.4) * dpi) },
    background: "#ffffff",
    font: { fontFiles: [fonts.regular, fonts.italic], loadSystemFonts: false, defaultFontFamily: "Liberation Sans", sansSerifFamily: "Liberation Sans" },
    shapeRendering: 2,
    textRendering: 1,
  });
  return setPngDpi(new Uint8Array(image.asPng()), dpi);
}
