/** Decoded camera images: one or more pages of grey pixels. */

/** Pixel storage of one page, row-major (index = row × width + column). */
export type PixelArray = Uint8Array | Uint16Array | Float32Array;

/** A decoded image or stack of images of equal size. */
export interface ImageStack {
  /** Pixels per row. */
  width: number;
  /** Rows. */
  height: number;
  /** Bits per sample as stored (8, 16 or 32). */
  bitDepth: 8 | 16 | 32;
  /** "uint" for integer detector codes, "float" for 32-bit floating point. */
  sampleFormat: "uint" | "float";
  /** One array per page, grey values (colour images are averaged over R, G, B). */
  pages: PixelArray[];
  /** True when the pixels are integer codes straight from a detector (not averaged colour). */
  integerCodes: boolean;
  /** Largest code the format can hold (255, 65535) for integer images, else undefined. */
  topCode: number | undefined;
  /** "png" or "tiff". */
  format: "png" | "tiff";
  /** Notes on the conversion (e.g. "RGB averaged to grey"). */
  notes: string[];
  /** Pixel pitch from the file's resolution field (m), when the file states one in metres. */
  pixelPitchFromFile?: number;
}
