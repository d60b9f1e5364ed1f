/** Node host of the command line. */
import * as fs from 'fs';
import { runCli } from './main';

process.exitCode = runCli(process.argv.slice(2), {
  readFile: (p) => fs.readFileSync(p, 'utf8'),
  out: (t) => process.stdout.write(t + '\n'),
  err: (t) => process.stderr.write(t + '\n'),
  exists: (p) => fs.existsSync(p),
  // 'wx' fails with EEXIST rather than replace a file created since the check
  writeFile: (p, t, overwrite) => fs.writeFileSync(p, t, { encoding: 'utf8', flag: overwrite ? 'w' : 'wx' }),
});
