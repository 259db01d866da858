// Benchmark dispatcher: `npm run bench -- B1` runs bench/B1.ts (problems in ../shared/bench/PROBLEMS.md).
// Words after a `--option` belong to the benchmarks (e.g. `npm run bench -- B6 --count 10`), which read process.argv.
const words = process.argv.slice(2);
const names = words.filter((w, i) => !w.startsWith("--") && !(i > 0 && words[i - 1].startsWith("--")));
if (names.length === 0) {
  process.stderr.write("usage: npm run bench -- B1|B2|B3|B4|B5|B6|B7|B8|B9|B10|models [more...] [--count N] [--models a,b]\n");
  process.exit(2);
}
for (const name of names) {
  if (!/^[A-Za-z0-9_-]+$/.test(name)) {
    process.stderr.write(`bench: invalid benchmark name ${JSON.stringify(name)}\n`);
    process.exit(2);
  }
  const module = await import(`./${name}.ts`).catch((error: unknown) => {
    process.stderr.write(`bench: no benchmark ${name} (bench/${name}.ts): ${String(error)}\n`);
    process.exit(2);
  });
  if (typeof module.main === "function") await module.main();
}
