#!/usr/bin/env node
/**
 * Screenshots of the preview pane in Debian's headless Chromium at task-pane
 * widths (320 and 420 px), for looking at layouts and for the README.
 * Run after `npm run build`: node test/browser/screenshots.js [outdir]
 * Writes pane-<method>-<width>.png to outdir (default dist/screenshots; pane-default: the pane as it opens,
 * fitted with its first entry), assets/screenshots/pane-default.png (that view at 420 px: the automatic choice
 * with its runner-up), assets/screenshots/pane-dates.png (the trend fit of the demo with its date axis, 420 px) and
 * assets/screenshots/pane-decomposition.png (the demo taken apart with the season on, 420 px). The automatic choice
 * is drawn with its runner-up (the default comparison), and trend1-vs-spline compares two picked methods.
 */
const path = require('path');
const fs = require('fs');
const http = require('http');
const { chromium } = require('playwright-core');
const { handler } = require('../../scripts/serve.js');

const FLAGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];
const out = process.argv[2] || path.join(__dirname, '..', '..', 'dist', 'screenshots');

(async () => {
  fs.mkdirSync(out, { recursive: true });
  const server = http.createServer(handler);
  await new Promise((r) => server.listen(0, '127.0.0.1', r));
  const base = `http://127.0.0.1:${server.address().port}`;
  const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: FLAGS });
  for (const width of [320, 420]) {
    const page = await browser.newPage({ viewport: { width, height: 900 }, deviceScaleFactor: 1 });
    page.on('pageerror', (e) => console.error(`page error: ${e}`));
    await page.goto(`${base}/preview.html`);
    await page.waitForSelector('#sheet-table tr');
    // name-vs-other: the second method drawn for comparison; name@season: a decomposition's season setting
    // default: the pane as it opens (its first entry, the automatic choice), nothing chosen
    for (const shot of ['default', 'trend1', 'spline', 'auto', 'breaks-volatility', 'decompose-adaptive', 'decompose-adaptive@on', 'decompose-stl@on', 'trend1-vs-spline']) {
      const [first, second] = shot.split('-vs-');
      const [method, season] = first.split('@');
      if (method !== 'default') await page.selectOption('#method', method);
      if (second) await page.selectOption('#second', second);
      if (season) await page.selectOption('#season', season);
      await page.click('#run');
      // the fit runs in a worker: wait until the status no longer says it is fitting
      await page.waitForFunction(() => !/^Fitting/.test(document.querySelector('#status')?.textContent ?? ''), null, { timeout: 120000 });
      await page.waitForSelector('#results:not([hidden])');
      await page.waitForTimeout(200);
      const file = path.join(out, `pane-${shot}-${width}.png`);
      await page.locator('#pane').screenshot({ path: file });
      console.log(`wrote ${file}`);
      const forReadme = { default: 'pane-default.png', trend1: 'pane-dates.png', 'decompose-adaptive@on': 'pane-decomposition.png' };
      if (forReadme[shot] && width === 420) {
        const readme = path.join(__dirname, '..', '..', 'assets', 'screenshots', forReadme[shot]);
        await page.locator('#pane').screenshot({ path: readme, clip: undefined });
        console.log(`wrote ${readme}`);
      }
    }
    await page.click('#own-data summary');
    const sheet = path.join(out, `sheet-${width}.png`);
    await page.locator('#sheet-panel').screenshot({ path: sheet });
    console.log(`wrote ${sheet}`);
    await page.close();
  }
  await browser.close();
  server.close();
})().catch((e) => { console.error(e); process.exit(1); });
