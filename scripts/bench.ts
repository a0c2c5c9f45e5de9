/**
 * `npm run bench`: runs every benchmark module in scripts/bench/ (alphabetical), or only those named
 * on the command line (`npm run bench -- gas forecast`). Each module exports `run(): Promise<void>` and
 * prints one line per figure: `name: value unit (target …; ratio …)`.
 */
import { readdirSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import path from 'node:path';

const dir = fileURLToPath(new URL('./bench/', import.meta.url));
const wanted = process.argv.slice(2);
const modules = readdirSync(dir)
  .filter((f) => f.endsWith('.ts'))
  .map((f) => f.replace(/\.ts$/, ''))
  .filter((name) => wanted.length === 0 || wanted.includes(name))
  .sort();

let failed = false;
for (const name of modules) {
  console.log(`# ${name}`);
  try {
    const mod = (await import(pathToFileURL(path.join(dir, `${name}.ts`)).href)) as { run: () => Promise<void> };
    await mod.run();
  } catch (e) {
    failed = true;
    console.log(`${name}: FAILED ${(e as Error).stack ?? e}`);
  }
}
process.exit(failed ? 1 : 0);
