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
  assert(/penalty \(spline\) must be a number from 0; got -2/.test(status), `status was: ${status}`);
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

const poolStats = (page) => page.evaluate(() => { const rt = globalThis[Symbol.for('knotwise.pageRuntime')]; return rt && rt.pool ? { ...rt.pool.stats, running: rt.pool.running } : null; });

test('Cancel stops a fit running in the worker: the status says so, the worker is replaced, and the next fit works', async (page) => {
  await page.selectOption('#method', 'breaks-slope');
  await page.selectOption('#rule', 'auto');
  const before = await poolStats(page);
  assert(before, 'the pane has no worker pool');
  const t0 = Date.now();
  await page.click('#run');
  await page.waitForSelector('#progress:not([hidden])');
  const tShown = Date.now();
  await page.click('#cancel');
  await page.waitForFunction(() => /cancelled/i.test(document.querySelector('#status')?.textContent || ''));
  const tCancelled = Date.now();
  assert(await page.isHidden('#progress'), 'the progress bar is still shown after Cancel');
  const after = await poolStats(page);
  assert(after.workersTerminated === before.workersTerminated + 1, `workers terminated ${before.workersTerminated} -> ${after.workersTerminated}`);
  assert(after.workersStarted === before.workersStarted + 1, `workers started ${before.workersStarted} -> ${after.workersStarted}: no replacement`);
  assert(after.jobsCancelled === before.jobsCancelled + 1 && after.running === 0, `after cancel: ${JSON.stringify(after)}`);
  const idle = await page.evaluate(async () => { const t = performance.now(); await globalThis[Symbol.for('knotwise.pageRuntime')].pool.whenIdle(); return performance.now() - t; });
  console.log(`      (click to progress shown ${tShown - t0} ms; Cancel to status ${tCancelled - tShown} ms; replacement worker ready ${idle.toFixed(0)} ms later)`);
  await page.click('#run');
  await page.waitForFunction(() => document.querySelector('#result-title')?.textContent?.startsWith('Changepoints (slope)') && /^Fitted/.test(document.querySelector('#status')?.textContent || ''));
});

test('while a long fit runs the page has no long task over 100 ms (PerformanceObserver "longtask")', async (page) => {
  const supported = await page.evaluate(() => PerformanceObserver.supportedEntryTypes.includes('longtask'));
  assert(supported, 'this Chromium does not report long tasks');
  await page.evaluate(() => {
    window.__longTasks = [];
    window.__drawn = [];
    window.__longObserver = new PerformanceObserver((list) => { for (const e of list.getEntries()) window.__longTasks.push({ start: e.startTime, duration: Math.round(e.duration) }); });
    window.__longObserver.observe({ type: 'longtask' });
    // The moment each result has been drawn (the status turns to "Fitted" at the end of the task that draws it).
    window.__statusObserver = new MutationObserver(() => { if (/^Fitted/.test(document.querySelector('#status').textContent)) window.__drawn.push(performance.now()); });
    window.__statusObserver.observe(document.querySelector('#status'), { childList: true, characterData: true, subtree: true });
  });
  // The observer sees a deliberate 150 ms block on the page (so the check below can fail).
  await page.evaluate(() => new Promise((r) => setTimeout(() => { const t = performance.now(); while (performance.now() - t < 150); setTimeout(r, 50); }, 0)));
  const seen = await page.evaluate(() => window.__longTasks.splice(0).map((t) => t.duration));
  assert(seen.some((d) => d >= 150), `the observer missed a 150 ms block: ${JSON.stringify(seen)}`);
  // A new fit (a different column, so nothing is cached): slope changepoints and their penalty path, then trend order 3 with CV.
  await page.selectOption('#pick-y', '3');
  let busy = 0;
  for (const method of ['breaks-slope', 'trend3']) {
    await page.selectOption('#method', method);
    const t0 = Date.now();
    await page.click('#run');
    // Polled by timer, not on every animation frame, so the test itself does not keep the page rendering.
    await page.waitForFunction(() => /^Fitted/.test(document.querySelector('#status')?.textContent || '') && document.querySelector('#progress')?.hidden, null, { polling: 250 });
    busy += Date.now() - t0;
  }
  await page.evaluate(() => new Promise((r) => setTimeout(r, 100)));
  const { tasks, drawn } = await page.evaluate(() => { window.__longObserver.disconnect(); window.__statusObserver.disconnect(); return { tasks: window.__longTasks, drawn: window.__drawn }; });
  // The task that draws a finished result (chart, tables) is the pane's rendering, not the fit: it is reported, not counted.
  const drawing = (t) => drawn.some((d) => d >= t.start && d <= t.start + t.duration + 5);
  const whileFitting = tasks.filter((t) => !drawing(t)).map((t) => t.duration);
  const drawingTasks = tasks.filter(drawing).map((t) => t.duration);
  console.log(`      (fits took ${busy} ms in the worker; long tasks while fitting: ${JSON.stringify(whileFitting)} ms; drawing the results: ${JSON.stringify(drawingTasks)} ms)`);
  assert(drawn.length === 2, `expected two drawn results, saw ${drawn.length}`);
  assert(busy > 200, `the fits took only ${busy} ms: too short to show anything`);
  assert(whileFitting.every((d) => d <= 100), `long tasks over 100 ms while fitting: ${JSON.stringify(whileFitting)}`);
  await page.selectOption('#pick-y', '1');
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
  // Shared runtime: the pane's page itself registers every function.
  const onPane = (await p2.evaluate(() => Object.keys(window.__assoc))).sort();
  assert(JSON.stringify(onPane) === JSON.stringify(ids), `the pane's page associated ${onPane} but metadata declares ${ids}`);
  await p2.addScriptTag({ url: `${base}/functions.js` });
  const got = (await p2.evaluate(() => Object.keys(window.__assoc))).sort();
  assert(JSON.stringify(got) === JSON.stringify(ids), `associated ${got} but metadata declares ${ids}`);
  const cancelable = meta.functions.filter((f) => f.options && f.options.cancelable === true).map((f) => f.id).sort();
  const computing = ids.filter((id) => id !== 'OPTIONS');
  assert(JSON.stringify(cancelable) === JSON.stringify(computing), `cancelable in functions.json: ${cancelable}`);
  const isPromise = await p2.evaluate(() => window.__assoc.SMOOTH([[1], [3], [2], [5], [4], [6]], null, 'spline', 'df=3', null, null, {}) instanceof Promise);
  assert(isPromise, 'SMOOTH does not return a Promise');
  const out = await p2.evaluate(() => window.__assoc.SMOOTH([[1], [3], [2], [5], [4], [6]], null, 'spline', 'df=3', null, null, {}));
  assert(out.length === 6 && typeof out[0][0] === 'number', `SMOOTH returned ${JSON.stringify(out)}`);
  const err = await p2.evaluate(async () => { try { await window.__assoc.SMOOTH([[1], [2]], [[1]], null, null, null, null, {}); return null; } catch (e) { return [e.code, e.message]; } });
  assert(err && err[0] === '#VALUE!' && /x has 1 rows but y has 2/.test(err[1]), `error was ${JSON.stringify(err)}`);
  // The computation ran in a Web Worker of the one shared runtime (the functions bundle found the pane's).
  const stats = await p2.evaluate(() => { const rt = globalThis[Symbol.for('knotwise.pageRuntime')]; return rt && rt.pool ? { ...rt.pool.stats, url: rt.workerUrl } : null; });
  assert(stats && stats.jobsRun >= 2 && stats.workersStarted >= 1 && /analysis-worker\.js$/.test(stats.url), `pool stats: ${JSON.stringify(stats)}`);
  // Excel's cancellation: onCanceled aborts the job and the call rejects.
  const cancelled = await p2.evaluate(async () => {
    const inv = {};
    const y = Array.from({ length: 400 }, (_, i) => [Math.sin(i / 9) * 10 + (i % 5)]);
    const p = window.__assoc.SEGMENTS(y, null, 'slope', null, null, inv);
    if (typeof inv.onCanceled !== 'function') return 'no onCanceled handler was set';
    inv.onCanceled();
    try { await p; return 'resolved after cancel'; } catch (e) { return e.message; }
  });
  assert(/cancelled/.test(cancelled), `after onCanceled: ${cancelled}`);
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
    // Shared runtime: <Runtimes> directly under the Workbook host, one resid for the runtime, the functions' page and file, and the pane.
    const host = [...doc.getElementsByTagName('Host')].find((h) => h.getAttributeNS('http://www.w3.org/2001/XMLSchema-instance', 'type') === 'Workbook');
    const runtimes = host ? [...host.children].filter((c) => c.localName === 'Runtimes') : [];
    const runtime = runtimes.length === 1 ? [...runtimes[0].children].filter((c) => c.localName === 'Runtime') : [];
    const resid = (sel) => { const e = doc.querySelector(sel); return e ? e.getAttribute('resid') : null; };
    const shared = {
      runtimes: runtimes.length, runtime: runtime.map((r) => [r.getAttribute('resid'), r.getAttribute('lifetime')]),
      page: resid('ExtensionPoint[*|type="CustomFunctions"] Page SourceLocation'),
      functionFile: resid('FunctionFile'),
      pane: resid('Action[*|type="ShowTaskpane"] SourceLocation'),
      set: [...doc.getElementsByTagName('Set')].filter((e) => e.getAttribute('Name') === 'SharedRuntime').map((e) => e.getAttribute('MinVersion')),
    };
    return { urls, ns, cf, shared };
  });
  const sh = info.shared;
  assert(sh.runtimes === 1 && sh.runtime.length === 1, `expected one <Runtimes><Runtime> under the Workbook host: ${JSON.stringify(sh)}`);
  const [rid, lifetime] = sh.runtime[0];
  assert(lifetime === 'long' && rid && rid.length <= 32, `runtime resid ${rid} (at most 32 characters), lifetime ${lifetime} (must be long)`);
  assert(sh.page === rid && sh.functionFile === rid && sh.pane === rid, `the functions' Page, FunctionFile and the pane must all use resid ${rid}: ${JSON.stringify(sh)}`);
  assert(JSON.stringify(sh.set) === '["1.1"]', `requirement set SharedRuntime 1.1 missing: ${JSON.stringify(sh.set)}`);
  assert(!info.error, `manifest.xml does not parse: ${info.error}`);
  assert(info.ns === 'KNOTWISE', `namespace is ${info.ns}`);
  assert(info.cf, 'no CustomFunctions extension point');
  assert(info.urls.length >= 7 && info.urls.every((u) => typeof u === 'string'), `manifest URLs: ${JSON.stringify(info.urls)}`);
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
