// mathjs's single-file build (same functions as the package entry): one file loads in a tenth
// of the time of the entry's module graph of about a thousand files.
declare module "mathjs/lib/browser/math.js" {
  const math: typeof import("mathjs");
  export default math;
}
