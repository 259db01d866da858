// The fit worker's bundled source, provided by widgets/build.ts at bundle time.
declare module "fringekit:fit-worker-source" {
  const source: string;
  export default source;
}
