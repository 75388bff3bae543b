// An assessor's path on a 390 px phone, each test failing on one of the trips met:
// figures counting every record while downloads counted confirmed ones (and the API and
// command line differing again); captions cut off at the right edge; the "not a listing
// decision" caveat five times on one screen; figures without their units.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { startServer, launchBrowser, screenshotPath, plainRecord, sendRecord, reviewAction } from './harness.mjs';

const PHONE = { width: 390, height: 844 };
const id = (n) => `c0000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
const PLACES = [[52.41, -4.09], [52.24, -4.26], [52.13, -4.55], [52.49, -4.05]];

let browser;
let server;
before(async () => {
  browser = await launchBrowser();
  server = await startServer();
  for (const [n, [latitude, longitude]] of PLACES.entries()) {
    await sendRecord(server, plainRecord(id(n), 'small-spotted catshark', { hoursAgo: 24 * 400 * (n + 1), latitude, longitude }));
  }
  // Three of the four confirmed by a reviewer (three years: enough for a trend).
  for (const n of [0, 1, 2]) {
    await reviewAction(server, id(n), { action: 'confirm', scientific_name: 'Scyliorhinus canicula', taxon_rank: 'species' });
  }
});
after(async () => {
  await browser?.close();
  server?.stop();
});

async function showFigures(page) {
  await page.goto(`${server.url}/desk/#figures`);
  await page.fill('#figures-taxon', 'Scyliorhinus canicula');
  await page.click('#figures-show');
  await page.waitForSelector('#range-table', { timeout: 15000 });
  await page.waitForSelector('#range-map svg', { timeout: 15000 });
  await page.waitForSelector('#trend-chart svg', { timeout: 15000 });
}

test('figures, downloads, the API and the command line\'s default all count confirmed records, and the screen says so', async () => {
  const page = await browser.newPage({ viewport: PHONE });
  try {
    await showFigures(page);
    assert.equal(await page.inputValue('#figures-state'), 'confirmed');
    assert.match(await page.textContent('#figures-state-words'), /^Counting confirmed records only/);
    assert.equal(await page.inputValue('#export-state'), 'confirmed');
    const records = await page.$$eval('#range-table tbody tr', (rows) => [...rows].find((r) => r.querySelector('th').textContent === 'Records')
      ?.querySelector('td')?.textContent);
    assert.equal(records, '3', 'the three confirmed records');
    const range = await (await fetch(`${server.url}/api/range?taxon=Scyliorhinus%20canicula`)).json();
    assert.equal(range.taxa[0].periods[0].records, 3, 'the API without a state agrees');
    const csv = await (await fetch(`${server.url}/api/export?format=csv`)).text();
    assert.equal(csv.trim().split('\n').length, 4, 'the download without a state agrees: header and three rows');
  } finally {
    await page.close();
  }
});

test('the caveat is said once on the screen, every figure has its unit, and no caption runs off the drawing', async () => {
  const page = await browser.newPage({ viewport: PHONE });
  try {
    await showFigures(page);
    const shown = await page.evaluate(() => document.querySelector('main').innerText);
    const caveats = shown.match(/not a listing decision/g) ?? [];
    assert.equal(caveats.length, 1, `the caveat is said once, not ${caveats.length} times`);
    const mapText = await page.$eval('#range-map svg', (svg) => svg.textContent);
    assert.match(mapText, /least over shifted grids \d+ km²/, 'the least AOO has its unit');
    assert.match(await page.textContent('.figures'), /animals per km walked/i, 'the encounter rate says per what');
    const chartText = await page.$eval('#trend-chart svg', (svg) => svg.textContent);
    assert.doesNotMatch(chartText, /per unit effort/, 'the chart says per what, too');
    assert.match(chartText, /Animals (recorded each year|per km walked each year)/);
    // Each drawing's text stays inside the drawing (SVG user units, getBBox).
    for (const selector of ['#range-map svg', '#trend-chart svg']) {
      const overflow = await page.$eval(selector, (svg) => {
        const width = svg.viewBox.baseVal.width || svg.width.baseVal.value;
        return [...svg.querySelectorAll('text')]
          .filter((t) => getComputedStyle(t).display !== 'none')
          .map((t) => ({ text: t.textContent.slice(0, 50), right: t.getBBox().x + t.getBBox().width }))
          .filter((t) => t.right > width + 0.5)
          .map((t) => `${t.text}… to ${Math.round(t.right)} of ${width}`);
      });
      assert.deepEqual(overflow, [], `${selector}: captions cut off`);
    }
    await page.screenshot({ path: screenshotPath('assessor-figures'), fullPage: true });
  } finally {
    await page.close();
  }
});
