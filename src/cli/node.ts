/** Node host of the command line. */
import * as fs from 'fs';
import { runCliWith } from './main';
import { runColumnsInThreads } from './threads';

// Several --y columns run in worker threads, one per core.
void runCliWith(process.argv.slice(2), {
  readFile: (p) => fs.readFileSync(p, 'utf8'),
  out: (t) => process.stdout.write(t + '\n'),
  err: (t) => process.stderr.write(t + '\n'),
}, (jobs) => runColumnsInThreads(jobs)).then((code) => { process.exitCode = code; });
