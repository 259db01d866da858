/** fringekit's version as written into results files; test/report checks it equals package.json's. */
export const FRINGEKIT_VERSION = "0.1.0";
