/**
 * Writes the `fringekit` Jupyter kernelspec so any Jupyter frontend can start the kernel.
 * Kernelspec layout: Jupyter client documentation, "Kernel specs" (kernel.json with argv,
 * display_name, language, interrupt_mode, metadata).
 */
import { mkdir } from "node:fs/promises";
import { homedir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { InvalidArgumentError } from "../src/errors.js";
import { writeFileAtomic } from "./figures/atomicWrite.js";

/** Name of the kernelspec directory; frontends show `KERNEL_DISPLAY_NAME`. */
export const KERNEL_NAME = "fringekit";
/** Name shown in the Jupyter kernel picker. */
export const KERNEL_DISPLAY_NAME = "TypeScript (fringekit)";

/** Where to install: the per-user registry, or `PREFIX/share/jupyter/kernels/` (e.g. a venv). */
export interface InstallKernelspecOptions {
  /** Install into the per-user Jupyter data directory (the default when no prefix is given). */
  user?: boolean;
  /** Install into `PREFIX/share/jupyter/kernels/fringekit`; PREFIX is resolved against the cwd. */
  prefix?: string;
  /** Node executable written into argv; defaults to the running Node (`process.execPath`). */
  nodePath?: string;
}

/** What `installKernelspec` wrote. */
export interface InstalledKernelspec {
  /** Absolute directory holding kernel.json. */
  directory: string;
  /** The kernel.json content as written. */
  spec: KernelSpec;
}

/** Content of kernel.json (Jupyter kernelspec format). */
export interface KernelSpec {
  argv: string[];
  display_name: string;
  language: string;
  interrupt_mode: "signal" | "message";
  env: Record<string, string>;
  metadata: Record<string, unknown>;
}

/** Absolute path of the compiled launcher that Jupyter runs (dist/kernel-ext/launch.js). */
export function launcherPath(): string {
  return fileURLToPath(new URL("./launch.js", import.meta.url));
}

/**
 * The kernel.json content for this installation: absolute Node path and launcher path, so the
 * kernel starts no matter which `node` is first on the frontend's PATH.
 * @param nodePath absolute path of the Node executable
 */
export function kernelSpecFor(nodePath: string = process.execPath): KernelSpec {
  if (!path.isAbsolute(nodePath)) {
    throw new InvalidArgumentError("nodePath", nodePath, "an absolute path to the node executable");
  }
  return {
    argv: [nodePath, launcherPath(), "{connection_file}"],
    display_name: KERNEL_DISPLAY_NAME,
    language: "typescript",
    interrupt_mode: "signal",
    env: {},
    metadata: { fringekit: { launcher: "kernel-ext/launch.js" } },
  };
}

/**
 * The per-user Jupyter data directory's kernels folder (Jupyter core's `jupyter_data_dir`):
 * $JUPYTER_DATA_DIR, else ~/Library/Jupyter on macOS, %APPDATA%\jupyter on Windows,
 * else $XDG_DATA_HOME/jupyter or ~/.local/share/jupyter.
 */
export function userKernelsDir(env: NodeJS.ProcessEnv = process.env): string {
  if (env.JUPYTER_DATA_DIR) return path.join(path.resolve(env.JUPYTER_DATA_DIR), "kernels");
  if (process.platform === "darwin") return path.join(homedir(), "Library", "Jupyter", "kernels");
  if (process.platform === "win32" && env.APPDATA) return path.join(env.APPDATA, "jupyter", "kernels");
  const xdg = env.XDG_DATA_HOME || path.join(homedir(), ".local", "share");
  return path.join(xdg, "jupyter", "kernels");
}

/**
 * Installs the `fringekit` kernelspec (kernel.json) for Jupyter.
 * With `prefix`, `JUPYTER_PATH=PREFIX/share/jupyter jupyter kernelspec list` shows it; with
 * `user` (default) it lands in the per-user data directory. The file is written atomically
 * (writeFileAtomic); an existing fringekit kernelspec there is replaced.
 * @returns the directory written and the spec
 */
export async function installKernelspec(options: InstallKernelspecOptions = {}): Promise<InstalledKernelspec> {
  const { user, prefix, nodePath } = options;
  if (user && prefix !== undefined) {
    throw new InvalidArgumentError("options", { user, prefix }, "give either user or prefix, not both");
  }
  if (prefix !== undefined && (typeof prefix !== "string" || prefix.trim() === "")) {
    throw new InvalidArgumentError("prefix", prefix, "a directory path such as ./venv");
  }
  const kernelsDir = prefix !== undefined
    ? path.join(path.resolve(prefix), "share", "jupyter", "kernels")
    : userKernelsDir();
  const directory = path.join(kernelsDir, KERNEL_NAME);
  const spec = kernelSpecFor(nodePath ?? process.execPath);
  await mkdir(directory, { recursive: true });
  const target = path.join(directory, "kernel.json");
  await writeFileAtomic(target, JSON.stringify(spec, null, 2) + "\n");
  return { directory, spec };
}
