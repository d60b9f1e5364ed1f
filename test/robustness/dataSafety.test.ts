/**
 * The data-safety statements of the README, checked on the code: no network
 * requests and no code built from text (eval, the Function constructor) in our
 * sources, nor in the bundles we ship (dist/web/*.js, third-party code
 * included). `npm test` builds the bundles before jest runs, so they are read
 * fresh there; a jest run without a build skips the bundle check and says so.
 */
import * as fs from 'fs';
import * as path from 'path';

const root = path.join(__dirname, '..', '..');

function files(dir: string, ext: RegExp): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    return e.isDirectory() ? files(p, ext) : ext.test(e.name) ? [p] : [];
  });
}

/** Code built from text at run time. */
const CODE_FROM_TEXT: [string, RegExp][] = [['eval(', /\beval\s*\(/], ['new Function', /\bnew\s+Function\s*\(/], ['Function(', /(^|[^.\w$])Function\s*\(\s*["'`]/]];
/** Ways a page or worker reaches the network. */
const NETWORK: [string, RegExp][] = [['fetch(', /(^|[^\w$])fetch\s*\(/], ['XMLHttpRequest', /XMLHttpRequest/], ['WebSocket', /\bWebSocket\b/], ['EventSource', /\bEventSource\b/], ['sendBeacon', /sendBeacon/]];

function hits(file: string, patterns: [string, RegExp][]): string[] {
  const text = fs.readFileSync(file, 'utf8');
  return patterns.filter(([, re]) => re.test(text)).map(([name]) => `${path.relative(root, file)}: ${name}`);
}

describe('data safety', () => {
  const sources = files(path.join(root, 'src'), /\.(ts|html)$/);

  test('our sources neither reach the network nor run code built from text', () => {
    expect(sources.length).toBeGreaterThan(20);
    expect(sources.flatMap((f) => hits(f, [...CODE_FROM_TEXT, ...NETWORK]))).toEqual([]);
  });

  const bundles = files(path.join(root, 'dist', 'web'), /\.js$/).filter((f) => path.dirname(f) === path.join(root, 'dist', 'web'));
  (bundles.length ? test : test.skip)(`the shipped bundles dist/web/*.js hold no eval or Function constructor and no network calls${bundles.length ? '' : ' (not built: npm test builds them first)'}`, () => {
    expect(bundles.flatMap((f) => hits(f, [...CODE_FROM_TEXT, ...NETWORK]))).toEqual([]);
  });
});
