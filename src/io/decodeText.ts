/**
 * Bytes → text for data tables: UTF-8 (with or without a byte-order mark), refusing binary
 * content and UTF-16 with a clear message. Pure code: TextDecoder is not in ES2022.
 */
import { DataError } from "../errors.js";

/**
 * Decodes UTF-8 bytes of a text table. Invalid sequences become U+FFFD (then fail as
 * non-numeric cells with their line number); NUL bytes or UTF-16 byte-order marks are refused.
 * @param bytes  file content
 * @param source file name for error messages
 */
export function decodeText(bytes: Uint8Array, source: string): string {
  if (bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff))) {
    throw new DataError(source, "the file is UTF-16 text", "save it as UTF-8 (or plain ASCII) text");
  }
  const nul = bytes.indexOf(0);
  if (nul >= 0) {
    throw new DataError(source, `binary content (a zero byte at offset ${nul}), not a text table or a PNG/TIFF image`, "give a CSV/TSV text table, a PNG or a TIFF file");
  }
  const start = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  const parts: string[] = [];
  const codes: number[] = [];
  const flush = (): void => {
    parts.push(String.fromCharCode(...codes));
    codes.length = 0;
  };
  for (let i = start; i < bytes.length; ) {
    const b0 = bytes[i] as number;
    let code: number;
    let length: number;
    if (b0 < 0x80) { code = b0; length = 1; }
    else if (b0 >= 0xc2 && b0 < 0xe0) { code = b0 & 0x1f; length = 2; }
    else if (b0 >= 0xe0 && b0 < 0xf0) { code = b0 & 0x0f; length = 3; }
    else if (b0 >= 0xf0 && b0 < 0xf5) { code = b0 & 0x07; length = 4; }
    else { code = 0xfffd; length = 1; }
    if (length > 1) {
      let valid = i + length <= bytes.length;
      for (let k = 1; valid && k < length; k++) {
        const b = bytes[i + k] as number;
        if ((b & 0xc0) !== 0x80) valid = false;
        else code = (code << 6) | (b & 0x3f);
      }
      if (!valid) { code = 0xfffd; length = 1; }
    }
    i += length;
    if (code > 0xffff) {
      code -= 0x10000;
      codes.push(0xd800 + (code >> 10), 0xdc00 + (code & 0x3ff));
    } else codes.push(code);
    if (codes.length >= 8192) flush();
  }
  flush();
  return parts.join("");
}
