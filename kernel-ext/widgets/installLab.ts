/**
 * Installs fringekit's prebuilt JupyterLab 4 extension (widgets/dist/labextension, built by
 * `npx tsx widgets/build.ts --lab`) into a Jupyter data folder's labextensions/, where
 * JupyterLab finds prebuilt extensions without a rebuild.
 * Command line: `node dist/kernel-ext/widgets/installLab.js [--prefix DIR | --data-dir DIR]`.
 */
import { existsSync } from "node:fs";
import { cp, mkdir, readFile, rename, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { DataError } from "../../src/errors.js";

/** The built extension folder (from the sources or from dist/). */
export function labExtensionSource(): string {
  const here = path.dirname(fileURLToPath(import.meta.url));
  const found = [path.resolve(here, "../../widgets/dist/labextension"), path.resolve(here, "../../../widgets/dist/labextension")]
    .find((dir) => existsSync(path.join(dir, "package.json")));
  if (!found) throw new DataError("widgets/dist/labextension", "the JupyterLab extension is not built", "build it with `npx tsx widgets/build.ts --lab`");
  return found;
}

/**
 * The user's Jupyter data folder: $JUPYTER_DATA_DIR, else ~/Library/Jupyter (macOS),
 * %APPDATA%\jupyter (Windows) or $XDG_DATA_HOME/jupyter (~/.local/share/jupyter), as Jupyter uses.
 */
export function jupyterDataDir(env: NodeJS.ProcessEnv = process.env): string {
  if (env.JUPYTER_DATA_DIR) return env.JUPYTER_DATA_DIR;
  if (process.platform === "darwin") return path.join(os.homedir(), "Library", "Jupyter");
  if (process.platform === "win32" && env.APPDATA) return path.join(env.APPDATA, "jupyter");
  return path.join(env.XDG_DATA_HOME || path.join(os.homedir(), ".local", "share"), "jupyter");
}

/**
 * Copy the extension to `<dataDir>/labextensions/<name>/` (replacing an older copy atomically:
 * copy beside, then rename). With `prefix`, dataDir is `<prefix>/share/jupyter`.
 * @returns the installed folder
 */
export async function installLabExtension(options: { prefix?: string; dataDir?: string } = {}): Promise<string> {
  const source = labExtensionSource();
  const { name } = JSON.parse(await readFile(path.join(source, "package.json"), "utf8")) as { name: string };
  const dataDir = options.dataDir ?? (options.prefix ? path.join(options.prefix, "share", "jupyter") : jupyterDataDir());
  const target = path.join(dataDir, "labextensions", name);
  const staging = `${target}.${process.pid}.tmp`;
  await mkdir(path.dirname(target), { recursive: true });
  await rm(staging, { recursive: true, force: true });
  await cp(source, staging, { recursive: true });
  await rm(target, { recursive: true, force: true });
  await rename(staging, target);
  return target;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const args = process.argv.slice(2);
  const value = (flag: string) => {
    const i = args.indexOf(flag);
    return i >= 0 ? args[i + 1] : undefined;
  };
  installLabExtension({ prefix: value("--prefix"), dataDir: value("--data-dir") })
    .then((dir) => process.stdout.write(`installed the fringekit widgets JupyterLab extension in ${dir}\n`))
    .catch((error: Error) => {
      process.stderr.write(`fringekit: ${error.message}\n`);
      process.exit(1);
    });
}
