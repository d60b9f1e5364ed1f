#!/usr/bin/env node
// Serves dist/web on localhost (default port 3000). With --https it uses the
// Office development certificates (created by `npx office-addin-dev-certs install`)
// so Excel can sideload manifest.xml; without, plain http serves the preview.
const fs = require('fs');
const path = require('path');
const http = require('http');
const https = require('https');
const os = require('os');

const root = path.join(__dirname, '..', 'dist', 'web');
const args = process.argv.slice(2);
const port = Number((args.find((a) => a.startsWith('--port=')) || '--port=3000').slice(7));
const useHttps = args.includes('--https');
const types = { '.html': 'text/html; charset=utf-8', '.js': 'text/javascript', '.json': 'application/json', '.css': 'text/css', '.png': 'image/png', '.xml': 'application/xml', '.csv': 'text/csv', '.map': 'application/json' };

function handler(req, res) {
  const url = decodeURIComponent((req.url || '/').split('?')[0]);
  const file = path.normalize(path.join(root, url === '/' ? 'preview.html' : url));
  if (!file.startsWith(root)) { res.writeHead(403); res.end(); return; }
  fs.readFile(file, (err, data) => {
    if (err) { res.writeHead(404, { 'content-type': 'text/plain' }); res.end('not found'); return; }
    res.writeHead(200, { 'content-type': types[path.extname(file)] || 'application/octet-stream', 'access-control-allow-origin': '*', 'cache-control': 'no-store' });
    res.end(data);
  });
}

function start() {
  if (!fs.existsSync(path.join(root, 'preview.html'))) { console.error('dist/web is missing: run npm run build first.'); process.exit(1); }
  let server;
  if (useHttps) {
    const dir = path.join(os.homedir(), '.office-addin-dev-certs');
    const key = path.join(dir, 'localhost.key'), cert = path.join(dir, 'localhost.crt');
    if (!fs.existsSync(key) || !fs.existsSync(cert)) { console.error(`--https needs ${cert} and ${key}: run npx office-addin-dev-certs install first.`); process.exit(1); }
    server = https.createServer({ key: fs.readFileSync(key), cert: fs.readFileSync(cert) }, handler);
  } else server = http.createServer(handler);
  server.listen(port, '127.0.0.1', () => {
    const base = `${useHttps ? 'https' : 'http'}://localhost:${port}`;
    console.log(`Knotwise is served at ${base}`);
    console.log(`  Preview (no Excel needed): ${base}/preview.html`);
    console.log(`  Task pane page:            ${base}/taskpane.html`);
    console.log(`  Functions metadata:        ${base}/functions.json`);
    console.log(`  Sideload into Excel:       manifest.xml (needs --https; see README)`);
  });
  return server;
}

if (require.main === module) start();
module.exports = { start, handler };
