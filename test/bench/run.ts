/**
 * npm run bench: runs every test/bench/*.bench.ts and prints one JSON line per
 * measurement. `--quick` runs small sizes only.
 */
import * as os from 'os';
import * as fs from 'fs';
import * as path from 'path';

const quick = process.argv.includes('--quick');
const only = process.argv.find((a) => a.startsWith('--only='))?.slice(7);
const emit = (record: Record<string, unknown>) => process.stdout.write(JSON.stringify(record) + '\n');
emit({ bench: 'machine', node: process.version, cpus: os.cpus().length, cpu: os.cpus()[0]?.model ?? 'unknown', memoryGiB: Math.round(os.totalmem() / 2 ** 30), quick });
const files = fs.readdirSync(__dirname).filter((f) => f.endsWith('.bench.js')).sort();
(async () => {
  for (const f of files) {
    const name = f.replace(/\.bench\.js$/, '');
    if (only && only !== name) continue;
    // eslint-disable-next-line @typescript-eslint/no-var-requires
    const mod = require(path.join(__dirname, f)) as { run(emit: (r: Record<string, unknown>) => void, quick: boolean): void | Promise<void> };
    await mod.run(emit, quick); // a module may measure asynchronously (worker threads)
  }
})().catch((e) => { console.error(e); process.exitCode = 1; });
