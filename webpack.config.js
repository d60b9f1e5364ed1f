/* Builds the add-in into dist/: the task pane (and its standalone preview),
 * the custom-functions bundle with functions.json generated from JSDoc, the
 * manifest and the icons. */
const path = require('path');
const HtmlWebpackPlugin = require('html-webpack-plugin');
const CopyWebpackPlugin = require('copy-webpack-plugin');
const CustomFunctionsMetadataPlugin = require('custom-functions-metadata-plugin');

const FUNCTION_FILES = ['./src/functions/smoothing.ts', './src/functions/breaks.ts', './src/functions/options.ts'];

module.exports = (env, argv) => ({
  mode: argv.mode || 'production',
  devtool: 'source-map',
  entry: {
    taskpane: './src/taskpane/main.ts',
    functions: './src/functions/register.ts',
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
    new CustomFunctionsMetadataPlugin({ output: 'functions.json', input: FUNCTION_FILES }),
    new HtmlWebpackPlugin({
      filename: 'taskpane.html', template: './src/taskpane/taskpane.html', chunks: ['taskpane'],
      officeScript: '<script src="https://appsforoffice.microsoft.com/lib/1/hosted/office.js"></script>',
    }),
    new HtmlWebpackPlugin({ filename: 'preview.html', template: './src/taskpane/taskpane.html', chunks: ['taskpane'], officeScript: '' }),
    new HtmlWebpackPlugin({ filename: 'functions.html', template: './src/functions/functions.html', chunks: ['functions'] }),
    new CopyWebpackPlugin({ patterns: [{ from: 'assets', to: 'assets' }, { from: 'manifest.xml', to: 'manifest.xml' }, { from: 'src/taskpane/taskpane.css', to: 'taskpane.css' }] }),
  ],
  performance: { hints: false },
});
