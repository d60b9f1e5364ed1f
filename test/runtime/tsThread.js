// Runs a TypeScript worker entry in a Node worker thread for the tests:
// compiles each .ts file on require with TypeScript's transpileModule (so the
// tests exercise the same sources the bundles are built from). Compiled files
// are kept in the system's temporary folder, keyed by path, size and time of
// change, so later threads start quickly.
const fs = require('fs');
const os = require('os');
const path = require('path');
const crypto = require('crypto');
const { workerData } = require('worker_threads');

const cacheDir = path.join(os.tmpdir(), 'knotwise-test-ts');
fs.mkdirSync(cacheDir, { recursive: true });
let ts = null;

require.extensions['.ts'] = (module, filename) => {
  const st = fs.statSync(filename);
  const key = crypto.createHash('sha1').update(`${filename}:${st.size}:${st.mtimeMs}`).digest('hex');
  const cached = path.join(cacheDir, `${key}.js`);
  let code;
  try {
    code = fs.readFileSync(cached, 'utf8');
  } catch {
    ts = ts || require('typescript');
    code = ts.transpileModule(fs.readFileSync(filename, 'utf8'), {
      compilerOptions: { module: ts.ModuleKind.CommonJS, target: ts.ScriptTarget.ES2020, esModuleInterop: true },
      fileName: filename,
    }).outputText;
    const tmp = `${cached}.${process.pid}.${Math.random().toString(36).slice(2)}`;
    fs.writeFileSync(tmp, code);
    fs.renameSync(tmp, cached);
  }
  module._compile(code, filename);
};
require(workerData.entry);
