// Runs a TypeScript worker entry in a Node worker thread for the tests:
// compiles each .ts file on require with TypeScript's transpileModule
// (the tests then exercise the same sources the bundles are built from).
const fs = require('fs');
const ts = require('typescript');
const { workerData } = require('worker_threads');

require.extensions['.ts'] = (module, filename) => {
  const out = ts.transpileModule(fs.readFileSync(filename, 'utf8'), {
    compilerOptions: { module: ts.ModuleKind.CommonJS, target: ts.ScriptTarget.ES2020, esModuleInterop: true },
    fileName: filename,
  });
  module._compile(out.outputText, filename);
};
require(workerData.entry);
