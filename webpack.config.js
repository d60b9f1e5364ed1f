/* Builds the add-in into dist/: the task pane (and its standalone preview),
 * the custom-functions bundle with functions.json generated from JSDoc, the
 * analysis worker, the manifest and the icons.
 *
 * In Excel the pane's page is the shared runtime of the pane and the worksheet
 * functions (manifest.xml), so the taskpane bundle registers the functions too.
 * The analysis worker is its own entry, analysis-worker.js, which both pages
 * start from the URL of the bundle that loaded them (src/runtime/browser/pageRuntime.ts);
 * a separate entry keeps import.meta out of the sources, which jest and the
 * type checks compile as CommonJS. */
const path = require('path');
const HtmlWebpackPlugin = require('html-webpack-plugin');
const CopyWebpackPlugin = require('copy-webpack-plugin');
const webpack = require('webpack');
const { DefinePlugin } = webpack;
const { generateCustomFunctionsMetadata } = require('custom-functions-metadata');
const { version } = require('./package.json');

// Content-Security-Policy of the pane's pages: scripts and styles from the add-in's own origin only (and, inside
// Excel, Office.js from Microsoft's CDN); no eval, no inline scripts, no network requests at run time.
const csp = (office) => ["default-src 'none'", `script-src 'self'${office ? ' https://appsforoffice.microsoft.com' : ''}`, "style-src 'self'",
  "img-src 'self'", "connect-src 'none'", "font-src 'self'", "base-uri 'none'", "form-action 'none'", "object-src 'none'"].join('; ');

const FUNCTION_FILES = ['./src/functions/smoothing.ts', './src/functions/breaks.ts', './src/functions/options.ts', './src/functions/decompose.ts'];

/** Writes functions.json from the functions' JSDoc (as custom-functions-metadata-plugin does) but adds no
 * unguarded CustomFunctions.associate calls to their modules: those modules are also in the pane's bundle,
 * which runs outside Excel in the preview, and src/functions/register.ts associates them when CustomFunctions exists. */
class FunctionsMetadataPlugin {
  apply(compiler) {
    let generated;
    compiler.hooks.beforeCompile.tapPromise('FunctionsMetadataPlugin', async () => {
      generated = await generateCustomFunctionsMetadata(FUNCTION_FILES.map((f) => path.resolve(f)), true);
    });
    compiler.hooks.thisCompilation.tap('FunctionsMetadataPlugin', (compilation) => {
      if (generated.errors.length) for (const e of generated.errors) compilation.errors.push(new webpack.WebpackError(`functions metadata: ${e}`));
      else compilation.emitAsset('functions.json', new webpack.sources.RawSource(generated.metadataJson));
    });
  }
}

module.exports = (env, argv) => ({
  mode: argv.mode || 'production',
  devtool: 'source-map',
  entry: {
    taskpane: ['./src/functions/register.ts', './src/taskpane/main.ts'],
    functions: './src/functions/register.ts',
    'analysis-worker': './src/runtime/browser/analysisWorker.ts',
  },
  output: { path: path.resolve(__dirname, 'dist/web'), filename: '[name].js', clean: true },
  resolve: { extensions: ['.ts', '.js'] },
  module: {
    rules: [
      { test: /\.ts$/, exclude: /node_modules/, use: { loader: 'ts-loader', options: { configFile: 'tsconfig.web.json' } } },
      { test: /\.css$/, type: 'asset/source' },
    ],
  },
  plugins: [
    new FunctionsMetadataPlugin(),
    new HtmlWebpackPlugin({
      filename: 'taskpane.html', template: './src/taskpane/taskpane.html', chunks: ['taskpane'],
      officeScript: '<script src="https://appsforoffice.microsoft.com/lib/1/hosted/office.js"></script>', csp: csp(true),
    }),
    new HtmlWebpackPlugin({ filename: 'preview.html', template: './src/taskpane/taskpane.html', chunks: ['taskpane'], officeScript: '', csp: csp(false) }),
    new DefinePlugin({ KNOTWISE_VERSION: JSON.stringify(version) }),
    new HtmlWebpackPlugin({ filename: 'functions.html', template: './src/functions/functions.html', chunks: ['functions'] }),
    new CopyWebpackPlugin({ patterns: [{ from: 'assets', to: 'assets' }, { from: 'manifest.xml', to: 'manifest.xml' }, { from: 'src/taskpane/taskpane.css', to: 'taskpane.css' }, { from: 'node_modules/uplot/dist/uPlot.min.css', to: 'uPlot.min.css' }] }),
  ],
  performance: { hints: false },
  // No shim for Node's `global` (read-excel-file only asks whether it exists): webpack's shim builds a function from text.
  node: { global: false },
});
