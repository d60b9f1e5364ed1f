#!/usr/bin/env node
/**
 * Browser tests: the built add-in (dist/web) in Debian's headless Chromium via
 * playwright-core. Checks the standalone preview pane end to end (fit, chart,
 * warnings, confirmation before overwriting cells) and that the custom-functions
 * bundle associates every function that functions.json declares.
 * Run after `npm run build`. Prints "N passed, N failed".
 */
const path = require('path');
const fs = require('fs');
const http = require('http');
const { chromium } = require('playwright-core');
const { handler } = require('../../scripts/serve.js');

const FLAGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];
const tests = [];
const test = (name, fn) => tests.push({ name, fn });
const assert = (cond, msg) => { if (!cond) throw new Error(msg); };

test('the preview shows the demo sheet', async (page) => {
  const rows = await page.$$eval('#sheet-table tr', (r) => r.length);
  assert(rows === 157, `expected 156 data rows and a header, got ${rows}`);
});

test('fitting the spline draws the data, the fit, end zones and the criterion curve', async (page) => {
  await page.selectOption('#method', 'spline');
  await page.click('#run');
  await page.waitForSelector('#results:not([hidden])');
  const circles = await page.$$eval('#chart .points circle', (c) => c.length);
  assert(circles === 153, `expected 153 points (156 rows less 3 unusable), got ${circles}`);
  assert(await page.$('#chart path.fit'), 'no fitted curve');
  assert((await page.$$('#chart rect.zone-boundary')).length === 2, 'end zones missing');
  assert((await page.$$('#chart rect.zone-extrapolation')).length === 2, 'extrapolation zones missing');
  assert(await page.isVisible('#curve-box'), 'criterion curve hidden');
  const codes = await page.$$eval('#warnings li', (l) => l.map((x) => x.dataset.code));
  for (const c of ['dropped-cells', 'boundary']) assert(codes.includes(c), `warning ${c} missing: ${codes}`);
});

test('trend filtering marks its knots on the chart and lists them', async (page) => {
  await page.selectOption('#method', 'trend1');
  await page.click('#run');
  await page.waitForFunction(() => document.querySelector('#result-title')?.textContent?.startsWith('Trend'));
  const marks = await page.$$eval('#chart .markers line', (l) => l.length);
  const rows = await page.$$eval('#table tr', (r) => r.length);
  assert(marks >= 1, 'no knot markers');
  assert(rows === marks + 1, `knots table has ${rows - 1} rows for ${marks} markers`);
});

test('changepoints carry the warning that a break is not proof of its cause', async (page) => {
  await page.selectOption('#method', 'breaks-mean');
  await page.click('#run');
  await page.waitForFunction(() => document.querySelector('#result-title')?.textContent?.startsWith('Changepoints'));
  const codes = await page.$$eval('#warnings li', (l) => l.map((x) => x.dataset.code));
  assert(codes.includes('break-cause'), `break-cause missing: ${codes}`);
  assert(await page.isVisible('#curve-box'), 'penalty path (changes against cost) not shown');
  assert((await page.$$('#chart .markers line')).length >= 1, 'no break markers');
});

test('a bad penalty shows the engine message instead of a result', async (page) => {
  await page.selectOption('#method', 'spline');
  await page.selectOption('#rule', 'value');
  await page.fill('#rule-value', '-2');
  await page.click('#run');
  const status = await page.textContent('#status');
  assert(/penalty must be a finite number >= 0; got -2/.test(status), `status was: ${status}`);
  assert(await page.isHidden('#results'), 'results still shown after an error');
  await page.selectOption('#rule', 'auto');
});

test('writing beside the data asks before replacing cells, and Cancel leaves them', async (page) => {
  await page.selectOption('#method', 'spline');
  await page.click('#run');
  await page.waitForSelector('#results:not([hidden])');
  const before = await page.$$eval('#sheet-table tr td:nth-child(3)', (t) => t.slice(0, 5).map((x) => x.textContent));
  await page.click('#write');
  assert(await page.isVisible('#confirm'), 'no confirmation before overwriting column C');
  await page.click('#confirm-no');
  const same = await page.$$eval('#sheet-table tr td:nth-child(3)', (t) => t.slice(0, 5).map((x) => x.textContent));
  assert(JSON.stringify(same) === JSON.stringify(before), 'cells changed after Cancel');
  await page.click('#write');
  await page.click('#confirm-yes');
  const head = await page.$eval('#sheet-table tr th:nth-child(3)', (t) => t.textContent);
  assert(head.includes('orders (spline)'), `header after write: ${head}`);
  const blank = await page.$eval('#sheet-table tr:nth-child(35) td:nth-child(3)', (t) => t.textContent);
  assert(blank === '', `row 34 (blank input) should stay empty, got "${blank}"`);
});

test('the functions bundle associates every function that functions.json declares', async (page, base, browser) => {
  const meta = JSON.parse(fs.readFileSync(path.join(__dirname, '..', '..', 'dist', 'web', 'functions.json'), 'utf8'));
  const ids = meta.functions.map((f) => f.id).sort();
  const ctx = await browser.newContext();
  const p2 = await ctx.newPage();
  await p2.addInitScript(() => {
    window.__assoc = {};
    window.CustomFunctions = {
      associate: (id, fn) => { window.__assoc[id] = fn; },
      Error: class extends Error { constructor(code, message) { super(message); this.code = code; } },
      ErrorCode: { invalidValue: '#VALUE!' },
    };
  });
  await p2.goto(`${base}/preview.html`);
  await p2.addScriptTag({ url: `${base}/functions.js` });
  const got = (await p2.evaluate(() => Object.keys(window.__assoc))).sort();
  assert(JSON.stringify(got) === JSON.stringify(ids), `associated ${got} but metadata declares ${ids}`);
  const out = await p2.evaluate(() => window.__assoc.SMOOTH([[1], [3], [2], [5], [4], [6]], null, 'spline', 'df=3', null, null, {}));
  assert(out.length === 6 && typeof out[0][0] === 'number', `SMOOTH returned ${JSON.stringify(out)}`);
  const err = await p2.evaluate(async () => { try { await window.__assoc.SMOOTH([[1], [2]], [[1]], null, null, null, null, {}); return null; } catch (e) { return [e.code, e.message]; } });
  assert(err && err[0] === '#VALUE!' && /x has 1 rows but y has 2/.test(err[1]), `error was ${JSON.stringify(err)}`);
  await ctx.close();
});

test('the manifest is well-formed and points at the built pages, the functions and the KNOTWISE namespace', async (page, base) => {
  const info = await page.evaluate(async () => {
    const text = await (await fetch('manifest.xml')).text();
    const doc = new DOMParser().parseFromString(text, 'application/xml');
    if (doc.getElementsByTagName('parsererror').length) return { error: doc.getElementsByTagName('parsererror')[0].textContent };
    const urls = [...doc.getElementsByTagName('bt:Url'), ...doc.getElementsByTagName('bt:Image')].map((e) => e.getAttribute('DefaultValue')).filter((u) => u !== null);
    const ns = [...doc.getElementsByTagName('bt:String')].find((e) => e.getAttribute('id') === 'Functions.Namespace')?.getAttribute('DefaultValue');
    const cf = doc.querySelector('ExtensionPoint[*|type="CustomFunctions"]') !== null;
    return { urls, ns, cf };
  });
  assert(!info.error, `manifest.xml does not parse: ${info.error}`);
  assert(info.ns === 'KNOTWISE', `namespace is ${info.ns}`);
  assert(info.cf, 'no CustomFunctions extension point');
  assert(info.urls.length >= 8 && info.urls.every((u) => typeof u === 'string'), `manifest URLs: ${JSON.stringify(info.urls)}`);
  for (const u of info.urls) {
    const rel = u.replace(/^https:\/\/localhost:3000/, '');
    const res = await page.evaluate(async (r) => (await fetch(r)).status, rel);
    assert(res === 200, `${rel} named in the manifest is not served (status ${res})`);
  }
});

(async () => {
  if (!fs.existsSync(path.join(__dirname, '..', '..', 'dist', 'web', 'preview.html'))) {
    console.error('dist/web is missing: run npm run build first.');
    process.exit(1);
  }
  const server = http.createServer(handler);
  await new Promise((r) => server.listen(0, '127.0.0.1', r));
  const base = `http://127.0.0.1:${server.address().port}`;
  const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: FLAGS });
  const page = await browser.newPage({ viewport: { width: 1280, height: 1000 } });
  const pageErrors = [];
  page.on('pageerror', (e) => pageErrors.push(String(e)));
  await page.goto(`${base}/preview.html`);
  await page.waitForSelector('#sheet-table tr');
  let passed = 0, failed = 0;
  for (const t of tests) {
    try {
      await t.fn(page, base, browser);
      if (pageErrors.length) throw new Error(`page error: ${pageErrors.splice(0).join('; ')}`);
      passed++;
      console.log(`  ok  ${t.name}`);
    } catch (e) {
      failed++;
      console.log(`  FAIL ${t.name}: ${e.message}`);
    }
  }
  await page.screenshot({ path: path.join(__dirname, '..', '..', 'dist', 'preview-screenshot.png') });
  await browser.close();
  server.close();
  console.log(`browser: ${passed} passed, ${failed} failed`);
  process.exit(failed ? 1 : 0);
})().catch((e) => { console.error(e); process.exit(1); });
