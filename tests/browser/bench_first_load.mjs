// Benchmark (not a test): a walker's first visit on a slow mobile link, in Debian's
// headless Chromium against the real server and the release build. The link is
// simulated with the DevTools protocol (Network.emulateNetworkConditions): 1.6 Mbit/s
// down, 750 kbit/s up, 150 ms round trip — a slow 3G-class link (common practice for
// "slow mobile" in web performance work; the figures are the issue's).
//
// Printed beside their targets: bytes transferred for the first load up to the record
// form (the cautions read), the page's and the service worker's copy for flight mode
// together (≤ 400 KB), time to
// the first text on screen (first contentful paint, ≤ 3 s), time until the app's first
// screen is ready, and the offline reload once the service worker keeps the app (≤ 1 s).
// The baseline in the same run is the same build sent as-is (Accept-Encoding: identity),
// as every visit was before the build precompressed the files. Also printed: the phone's
// and the desk's bundle (wasm + JS) as built, raw and brotli; the phone never fetches
// the desk's (`/desk/`), and a visit that did would say so here.
//
//   cargo xtask bench        (or: WRACKLINE_BIN=… WRACKLINE_APP_DIR=… node tests/browser/bench_first_load.mjs)
import { statSync } from 'node:fs';
import path from 'node:path';
import { startServer, launchBrowser } from './harness.mjs';

const LINK = { offline: false, latency: 150, downloadThroughput: (1.6e6 / 8), uploadThroughput: (750e3 / 8) };
const TARGET = { bytes: 400 * 1024, firstText: 3000, offlineReload: 1000 };
const RUNS = 3;

const median = (values) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];

// One fresh visit (empty cache, no service worker yet), then an offline reload.
async function visit(browser, server, acceptEncoding) {
  const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
  try {
    const page = await context.newPage();
    const cdp = await context.newCDPSession(page);
    await cdp.send('Network.enable');
    await cdp.send('Network.emulateNetworkConditions', LINK);
    if (acceptEncoding) await cdp.send('Network.setExtraHTTPHeaders', { headers: { 'Accept-Encoding': acceptEncoding } });
    let bytes = 0;
    const encodings = new Map();
    // The service worker's own fetches (it keeps the app for flight mode) are not the
    // page's; Playwright reports them on the context, with their sizes as sent.
    let workerBytes = 0;
    context.on('requestfinished', async (request) => {
      if (!request.serviceWorker()) return;
      const sizes = await request.sizes().catch(() => null);
      if (sizes) workerBytes += sizes.responseBodySize + sizes.responseHeadersSize;
    });
    cdp.on('Network.responseReceived', (event) => {
      if (!event.response.url.startsWith('http')) return; // the browser's own data: icons
      const encoding = Object.entries(event.response.headers).find(([name]) => name.toLowerCase() === 'content-encoding')?.[1];
      encodings.set(event.requestId, `${new URL(event.response.url).pathname} ${encoding || 'as-is'}`);
    });
    cdp.on('Network.loadingFinished', (event) => { bytes += event.encodedDataLength; });
    await page.goto(server.url, { waitUntil: 'commit' });
    await page.waitForSelector('#safety-ok', { timeout: 120000 });
    const times = await page.evaluate(() => ({
      firstText: performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? NaN,
      ready: performance.now(),
    }));
    // The walker reads the cautions and gets the record form: what that fetches counts too.
    await page.click('#safety-ok');
    await page.waitForSelector('#record-form', { timeout: 120000 });
    await page.waitForLoadState('networkidle');
    const sent = [...encodings.values()];
    // Offline reload: the service worker answers from its cache.
    await page.waitForFunction(() => navigator.serviceWorker?.controller, null, { timeout: 120000 });
    const kept = workerBytes;
    await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
    await context.setOffline(true);
    await page.reload({ waitUntil: 'commit' });
    await page.waitForSelector('#record-form', { timeout: 30000 });
    const offlineReload = await page.evaluate(() => performance.now());
    return { bytes, ...times, offlineReload, sent, workerBytes: kept };
  } finally {
    await context.close();
  }
}

async function measure(browser, server, acceptEncoding) {
  const runs = [];
  for (let i = 0; i < RUNS; i++) runs.push(await visit(browser, server, acceptEncoding));
  const pick = (key) => median(runs.map((r) => r[key]));
  return {
    bytes: pick('bytes'), firstText: pick('firstText'), ready: pick('ready'), offlineReload: pick('offlineReload'),
    workerBytes: pick('workerBytes'), sent: runs[0].sent,
  };
}

const kb = (bytes) => `${(bytes / 1024).toFixed(0)} KB`;
const s = (ms) => `${(ms / 1000).toFixed(2)} s`;
const verdict = (value, target) => (value <= target ? 'meets' : 'MISSES');

// A bundle's code as built: its wasm and JS, raw and as the brotli copies the server sends.
function bundle(folder, name) {
  const size = (file) => statSync(path.join(process.env.WRACKLINE_APP_DIR, folder, file)).size;
  const files = [`${name}_bg.wasm`, `${name}.js`];
  return { raw: files.reduce((sum, f) => sum + size(f), 0), brotli: files.reduce((sum, f) => sum + size(`${f}.br`), 0) };
}

const server = await startServer();
const browser = await launchBrowser();
try {
  const baseline = await measure(browser, server, 'identity');
  const compressed = await measure(browser, server, null);
  console.log(`first load on a simulated slow link (1.6 Mbit/s down, 150 ms RTT), 390 px phone, headless Chromium; median of ${RUNS}`);
  console.log('                          as-is (baseline)   as served      target');
  const total = (r) => r.bytes + r.workerBytes;
  console.log(`bytes transferred, all   ${kb(total(baseline)).padEnd(19)}${kb(total(compressed)).padEnd(15)}≤ ${kb(TARGET.bytes)} (${verdict(total(compressed), TARGET.bytes)})`);
  console.log(`  of which the page's     ${kb(baseline.bytes).padEnd(19)}${kb(compressed.bytes).padEnd(15)}`);
  console.log(`  the service worker's    ${kb(baseline.workerBytes).padEnd(19)}${kb(compressed.workerBytes).padEnd(15)}(its copy for flight mode; mostly revalidations)`);
  console.log(`first text on screen      ${s(baseline.firstText).padEnd(19)}${s(compressed.firstText).padEnd(15)}≤ ${s(TARGET.firstText)} (${verdict(compressed.firstText, TARGET.firstText)})`);
  console.log(`app's first screen ready  ${s(baseline.ready).padEnd(19)}${s(compressed.ready).padEnd(15)}(no target)`);
  console.log(`offline reload            ${s(baseline.offlineReload).padEnd(19)}${s(compressed.offlineReload).padEnd(15)}≤ ${s(TARGET.offlineReload)} (${verdict(compressed.offlineReload, TARGET.offlineReload)})`);
  console.log(`as served / as-is: bytes ${(compressed.bytes / baseline.bytes).toFixed(2)}x, app ready ${(compressed.ready / baseline.ready).toFixed(2)}x`);
  console.log(`sent (as served): ${compressed.sent.join(', ')}`);
  const phoneBundle = bundle('', 'wrackline_app');
  const deskBundle = bundle('desk', 'wrackline_desk');
  console.log(`phone bundle (wasm + js) ${kb(phoneBundle.raw)} raw, ${kb(phoneBundle.brotli)} brotli; desk bundle (/desk/, never on the phone) ${kb(deskBundle.raw)} raw, ${kb(deskBundle.brotli)} brotli`);
  const deskFetched = [...baseline.sent, ...compressed.sent].filter((line) => line.startsWith('/desk/'));
  console.log(deskFetched.length ? `THE PHONE FETCHED DESK FILES: ${deskFetched.join(', ')}` : 'the phone fetched no desk files');
  console.log(`bench-row | first load, 1.6 Mbit/s 150 ms RTT, 390 px phone (\`tests/browser/bench_first_load.mjs\`) | ${kb(total(compressed))}, first text ${s(compressed.firstText)}, offline reload ${s(compressed.offlineReload)}; phone bundle ${kb(phoneBundle.brotli)} br, desk bundle ${kb(deskBundle.brotli)} br ${deskFetched.length ? 'FETCHED' : 'not fetched'} | as-is: ${kb(total(baseline))}, first text ${s(baseline.firstText)} | bytes ${(total(compressed) / total(baseline)).toFixed(2)}× | ≤ ${kb(TARGET.bytes)}, first text ≤ ${s(TARGET.firstText)}, offline ≤ ${s(TARGET.offlineReload)}`);
} finally {
  await browser.close();
  server.stop();
}
