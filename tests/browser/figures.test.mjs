// The figures page: for a taxon, the server's range map (records, hull, AOO cells over
// the coastline) and trend chart appear in the app, with the caution that they are
// inputs to an assessment; a name that is not on the checklist is said plainly.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { startServer, launchBrowser } from './harness.mjs';

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

async function send(server, id, year, lat, lon) {
  const record = {
    client_id: id, observed_at: `${year}-06-01T09:00:00+01:00`,
    position: { latitude: lat, longitude: lon, accuracy_m: 10, source: 'device' },
    species_guess: 'small-spotted catshark', length: null, sex: 'unknown', count: 1,
    condition: 'fresh_dead', setting: 'beach_stranding', human_signs: [], notes: null, observer_name: null,
  };
  const form = new FormData();
  form.append('record', JSON.stringify(record));
  const response = await fetch(`${server.url}/api/observations`, { method: 'POST', body: form });
  assert.equal(response.status, 200, await response.text());
}

test('range map and trend chart for a taxon appear with their caution', async () => {
  const server = await startServer();
  const page = await browser.newPage({ viewport: { width: 390, height: 844 } });
  try {
    await send(server, 'f0000000-0000-4000-8000-000000000001', 2022, 52.41, -4.09);
    await send(server, 'f0000000-0000-4000-8000-000000000002', 2023, 52.24, -4.26);
    await send(server, 'f0000000-0000-4000-8000-000000000003', 2024, 52.13, -4.55);
    await send(server, 'f0000000-0000-4000-8000-000000000004', 2024, 52.49, -4.05);
    await page.goto(`${server.url}/#figures`);
    await page.fill('#figures-taxon', 'Scyliorhinus canicula');
    await page.click('#figures-show');
    await page.waitForSelector('#range-map svg', { timeout: 15000 });
    await page.waitForSelector('#trend-chart svg', { timeout: 15000 });
    assert.match(await page.textContent('.figures .caution'), /inputs to a threatened-species assessment, not a listing decision/);
    await page.fill('#figures-taxon', 'sea serpent');
    await page.click('#figures-show');
    await page.waitForFunction(() => /not a taxon on the checklist/.test(document.querySelector('.figures')?.textContent), null, { timeout: 10000 });
  } finally {
    await page.close();
    server.stop();
  }
});
