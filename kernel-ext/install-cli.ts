/**
 * Tiny command for scripts and tests: `node dist/kernel-ext/install-cli.js [--user | --prefix DIR]`.
 * The `fringekit kernel install` command offers the same through the main command line.
 */
import { installKernelspec } from "./install.js";

async function main(argv: string[]): Promise<void> {
  let prefix: string | undefined;
  let user = false;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--user") user = true;
    else if (arg === "--prefix" && i + 1 < argv.length) prefix = argv[++i];
    else if (arg.startsWith("--prefix=")) prefix = arg.slice("--prefix=".length);
    else {
      process.stderr.write(`fringekit kernel install: unknown argument ${JSON.stringify(arg)}; use --user or --prefix DIR\n`);
      process.exit(2);
    }
  }
  const { directory } = await installKernelspec({ user, prefix });
  process.stdout.write(`installed kernelspec fringekit in ${directory}\n`);
}

main(process.argv.slice(2)).catch((error: unknown) => {
  process.stderr.write(`fringekit kernel install: ${error instanceof Error ? error.message : String(error)}\n`);
  process.exit(1);
});
