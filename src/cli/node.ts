/** Node host of the command line. */
import * as fs from 'fs';
import { runCliWith } from './main';
import { runColumnsInThreads } from './threads';
import type { SheetReader } from './xlsx';

// read-excel-file is loaded when a workbook is read (its CommonJS build), not for every CSV run.
// Its Node entry takes a Buffer (a plain Uint8Array would be taken for a path).
const readWorkbook: SheetReader = (input: Uint8Array, sheet, options) =>
  (require('read-excel-file/node') as { readSheet: SheetReader }).readSheet(Buffer.isBuffer(input) ? input : Buffer.from(input.buffer, input.byteOffset, input.byteLength), sheet, options);

// Several --y columns run in worker threads, one per core.
void runCliWith(process.argv.slice(2), {
  readFile: (p) => fs.readFileSync(p, 'utf8'),
  readBytes: (p) => fs.readFileSync(p),
  readWorkbook,
  out: (t) => process.stdout.write(t + '\n'),
  err: (t) => process.stderr.write(t + '\n'),
  exists: (p) => fs.existsSync(p),
  // 'wx' fails with EEXIST rather than replace a file created since the check
  writeFile: (p, t, overwrite) => fs.writeFileSync(p, t, { encoding: 'utf8', flag: overwrite ? 'w' : 'wx' }),
}, (jobs) => runColumnsInThreads(jobs)).then((code) => { process.exitCode = code; });
