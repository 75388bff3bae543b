// The figures page on a phone: for a taxon and two periods, the figures table (records,
// sites, EOO, AOO and its least value over shifted grids, each with its unit) side by side
// with the change, the criterion B and A texts, the trend's figures (rate per year with its
// interval, the window and how it was chosen, dispersion and model, Mann–Kendall and Sen's
// slope), the server's map and chart and the cautions; a name not on the checklist is said
// plainly. Then the downloads: the public form for anyone, the full form once signed in.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { startServer, launchBrowser, screenshotPath, REVIEWER } from './harness.mjs';

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

async function send(server, id, year, lat, lon, guess = 'small-spotted catshark') {
  const record = {
    client_id: id, observed_at: `${year}-06-01T09:00:00+01:00`,
    position: { latitude: lat, longitude: lon, accuracy_m: 10, source: 'device' },
    species_guess: guess, length: null, sex: 'unknown', count: 1,
    condition: 'fresh_dead', setting: 'beach_stranding', human_signs: [], notes: null, observer_name: null,
  };
  const form = new FormData();
  form.append('record', JSON.stringify(record));
  const response = await fetch(`${server.url}/api/observations`, { method: 'POST', body: form });
  assert.equal(response.status, 200, await response.text());
}

// The cells of the figures-table row whose label starts with `label`.
const cellsOf = (page, label) => page.$$eval('#range-table tbody tr', (rows, wanted) => {
  const row = [...rows].find((r) => r.querySelector('th').textContent.startsWith(wanted));
  return row ? [...row.querySelectorAll('td')].map((td) => td.textContent) : null;
}, label);

test('range and trend figures for a taxon, two periods side by side, with their cautions', async () => {
  const server = await startServer();
  const page = await browser.newPage({ viewport: { width: 390, height: 844 } });
  try {
    await send(server, 'f0000000-0000-4000-8000-000000000001', 2022, 52.41, -4.09);
    await send(server, 'f0000000-0000-4000-8000-000000000002', 2023, 52.24, -4.26);
    await send(server, 'f0000000-0000-4000-8000-000000000003', 2024, 52.13, -4.55);
    await send(server, 'f0000000-0000-4000-8000-000000000004', 2024, 52.49, -4.05);
    await page.goto(`${server.url}/desk/#figures`);
    await page.fill('#figures-taxon', 'Scyliorhinus canicula');
    await page.fill('#figures-period-1', '2021-2022');
    await page.fill('#figures-period-2', '2023-2024');
    // These records await review; the figures count confirmed ones unless told otherwise.
    await page.selectOption('#figures-state', 'any');
    await page.click('#figures-show');
    await page.waitForSelector('#range-table', { timeout: 15000 });
    await page.waitForSelector('#trend-figures', { timeout: 15000 });
    await page.waitForSelector('#range-map svg', { timeout: 15000 });
    await page.waitForSelector('#trend-chart svg', { timeout: 15000 });

    const headers = await page.$$eval('#range-table thead th', (ths) => ths.map((th) => th.textContent));
    assert.deepEqual(headers, ['Figure', '2021–2022', '2023–2024', 'Change']);
    assert.deepEqual(await cellsOf(page, 'Records'), ['1', '3', '+2']);
    assert.deepEqual(await cellsOf(page, 'Distinct sites'), ['1', '3', '+2']);
    const eoo = await cellsOf(page, 'EOO');
    assert.ok(eoo.slice(0, 2).every((c) => / km²$/.test(c)), `EOO with its unit: ${eoo}`);
    assert.match(eoo[2], /^\+[\d.,]+ km² \(\+[\d,]+%\)$/, 'one record has no hull, three do: the EOO grows');
    // One record: one 2 × 2 km cell, 4 km²; three records far apart: 12 km² (IUCN Guidelines §4.10).
    assert.deepEqual((await cellsOf(page, 'AOO')).slice(0, 2), ['4.0 km²', '12.0 km²']);
    assert.deepEqual((await cellsOf(page, 'Least AOO')).slice(0, 2), ['4.0 km²', '12.0 km²']);
    assert.match(await page.textContent('#grid-choice'), /fixed default, centred on 52° N, 10° E/);
    const criterionB = await page.textContent('#criterion-b');
    assert.match(criterionB, /2021–2022: EOO [\d.,]+ km² is .*\(B1: CR < 100, EN < 5,000, VU < 20,000 km²\)/);
    assert.match(criterionB, /2023–2024: .*AOO 12.0 km² is .*\(B2: CR < 10, EN < 500, VU < 2,000 km²\)/);

    const trend = await page.$$eval('#trend-figures .figure-line', (lines) =>
      Object.fromEntries(lines.map((l) => [l.querySelector('dt').textContent, l.querySelector('dd').textContent])));
    assert.match(trend['Rate of change per year'], /^[+-][\d.,]+%|10,000%/);
    assert.match(trend['Rate of change per year'], /95% interval/);
    // Three years cannot carry a trend over a 24-year window: the page says why, no number.
    assert.match(trend['Change over the assessment window'], /^not given: the 24-year window reaches too far beyond the 2 years fitted \(2022–2024\)/);
    assert.match(trend['Years fitted'], /^2022–2024/);
    assert.match(trend['How the window was chosen'], /24 years = the longer of 10 years and 3 × generation length \(8 years; checklist entry for Scyliorhinus canicula/);
    assert.match(trend['Dispersion and model'], /Pearson dispersion [\d.]+; (Poisson errors|quasi-Poisson|negative binomial)/);
    assert.match(trend['Mann–Kendall (tie-corrected)'], /tau = [-\d.]+, p = [\d.]+; Sen's slope/);
    assert.equal(trend['Animals recorded per year'], '2022 1, 2023 1, 2024 2');
    assert.match(await page.textContent('#criterion-a'), /No reduction over the assessment window is given, so no criterion-A band/);
    // The caveat is said once, at the top; the recording caution beside the figures.
    assert.match(await page.textContent('#figures-caveat'), /inputs to a threatened-species assessment, not a listing decision/);
    assert.doesNotMatch(await page.textContent('#figure-cautions'), /not a listing decision/, 'not said again');
    assert.match(await page.textContent('.figures'), /where people walk, fish and report/);
    // Laid out for the phone: nothing wider than the screen.
    assert.ok(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth), 'no sideways scrolling');
    await page.screenshot({ path: screenshotPath('figures'), fullPage: true });

    await page.fill('#figures-taxon', 'sea serpent');
    await page.click('#figures-show');
    await page.waitForFunction(() => /not a taxon on the checklist/.test(document.querySelector('.figures')?.textContent), null, { timeout: 10000 });
  } finally {
    await page.close();
    server.stop();
  }
});

test('anyone downloads the public form; a signed-in reviewer also the full form', async () => {
  const server = await startServer();
  const context = await browser.newContext({ viewport: { width: 390, height: 844 }, acceptDownloads: true });
  const page = await context.newPage();
  try {
    // The angelshark is "tenthDegree" in the demo checklist (Chapman 2020): generalised in public.
    await send(server, 'e0000000-0000-4000-8000-000000000001', 2024, 52.3467, -4.2611, 'angelshark');
    await send(server, 'e0000000-0000-4000-8000-000000000002', 2024, 52.4153, -4.0829);
    const download = async () => {
      const [file] = await Promise.all([page.waitForEvent('download'), page.click('#export-download')]);
      return { name: file.suggestedFilename(), text: readFileSync(await file.path(), 'utf8') };
    };
    await page.goto(`${server.url}/desk/#figures`);
    await page.waitForSelector('#export-download');
    assert.equal(await page.$('#export-full'), null, 'the full form is not offered to someone not signed in');
    await page.selectOption('#export-format', 'geojson');
    await page.selectOption('#export-state', 'any');
    await page.fill('#export-taxon', 'Squatina squatina');
    const publicFile = await download();
    assert.match(publicFile.name, /\.geojson$/);
    const features = JSON.parse(publicFile.text).features;
    assert.equal(features.length, 1, 'the taxon filter leaves the catshark out');
    assert.deepEqual(features[0].geometry.coordinates, [-4.3, 52.3], 'rounded to 0.1° (RFC 7946: longitude first)');
    assert.match(features[0].properties.dataGeneralizations, /rounded to the nearest 0.1 degree/);

    await page.selectOption('#export-format', 'csv');
    await page.fill('#export-taxon', '');
    await page.selectOption('#export-area', { index: 1 });
    const areaFile = await download();
    assert.match(areaFile.name, /\.csv$/);
    assert.match(areaFile.text, /Scyliorhinus canicula/);

    // Signed in as a reviewer (the review screen's sign-in), the full form is offered.
    const login = await page.evaluate(async (who) => (await fetch('/api/session', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(who) })).status, REVIEWER);
    assert.equal(login, 200);
    await page.reload();
    await page.waitForSelector('#export-full');
    await page.selectOption('#export-format', 'geojson');
    await page.selectOption('#export-state', 'any');
    await page.fill('#export-taxon', 'Squatina squatina');
    await page.check('#export-full');
    const fullFile = await download();
    assert.match(fullFile.name, /\.geojson$/);
    assert.deepEqual(JSON.parse(fullFile.text).features[0].geometry.coordinates, [-4.2611, 52.3467], 'as recorded');
  } finally {
    await context.close();
    server.stop();
  }
});
