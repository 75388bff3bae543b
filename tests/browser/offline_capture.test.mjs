// The walking skeleton end to end: a phone with no signal records two finds with
// photos, the page is reloaded while still offline (the app and its outbox must
// survive), the connection returns, and the server holds each record exactly once.
//
// Two negative controls show the test can fail: with the service worker blocked the
// offline reload cannot open the app, and with IndexedDB taken away the outbox keeps
// nothing; in both cases the same scenario must fail.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { startServer, launchBrowser, screenshotPath, demoPhoto } from './harness.mjs';

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

const FINDS = [
  { species: 'small-spotted catshark', length: '54', condition: 'fresh_dead', setting: 'beach_stranding', photo: 'catshark.jpg' },
  { species: 'thornback ray', length: '47', condition: 'decomposed', setting: 'beach_stranding', photo: 'ray.jpg' },
];

async function fillRecord(page, find) {
  await page.fill('#species', find.species);
  await page.fill('#length', find.length);
  await page.selectOption('#condition', find.condition);
  await page.selectOption('#setting', find.setting);
  await page.setInputFiles('#photo-input', demoPhoto(find.photo));
  await page.waitForSelector('.thumbs img');
  await page.click('#save-send');
}

async function entryStates(page) {
  return page.$$eval('.outbox-entry', (items) => items.map((li) => ({
    id: li.dataset.clientId,
    text: li.textContent,
  })));
}

// Runs the whole journey; throws at the first thing that does not happen.
async function offlineJourney(server, { serviceWorkers = 'allow', withoutIndexedDb = false, shots = false } = {}) {
  const context = await browser.newContext({
    serviceWorkers,
    viewport: { width: 390, height: 844 },
    geolocation: { latitude: 52.4153, longitude: -4.0829, accuracy: 9 },
    permissions: ['geolocation'],
  });
  try {
    if (withoutIndexedDb) {
      await context.addInitScript(() => Object.defineProperty(window, 'indexedDB', { value: undefined }));
    }
    const page = await context.newPage();
    page.on('pageerror', (err) => console.error('page error:', err.message));
    await page.goto(server.url);
    await page.click('#safety-ok', { timeout: 15000 });
    if (serviceWorkers === 'allow') {
      await page.waitForFunction(() => navigator.serviceWorker?.controller, null, { timeout: 15000 });
    }
    await page.waitForFunction(() => document.querySelector('#position-note')?.textContent.includes('±'), null, { timeout: 10000 });

    await context.setOffline(true);
    for (const [index, find] of FINDS.entries()) {
      await fillRecord(page, find);
      await page.waitForFunction((n) => document.querySelectorAll('.outbox-entry').length === n, index + 1, { timeout: 8000 });
    }
    if (shots) await page.screenshot({ path: screenshotPath('offline-two-records'), fullPage: true });

    await page.reload({ timeout: 10000 });
    await page.waitForFunction(() => document.querySelectorAll('.outbox-entry').length === 2, null, { timeout: 10000 });
    const offlineStates = await entryStates(page);
    assert.ok(offlineStates.every((e) => e.text.includes('waiting to send')), JSON.stringify(offlineStates));
    assert.equal((await server.records()).length, 0, 'nothing reaches the server while offline');

    await context.setOffline(false);
    await page.waitForFunction(
      () => [...document.querySelectorAll('.outbox-entry')].filter((li) => li.textContent.includes('received by the server')).length === 2,
      null, { timeout: 30000 },
    );
    if (shots) await page.screenshot({ path: screenshotPath('synced'), fullPage: true });

    // Ask for another round: a resend must not make a second copy.
    await page.click('#send-now');
    await page.waitForTimeout(1500);
    return { ids: (await entryStates(page)).map((e) => e.id), records: await server.records() };
  } finally {
    await context.close();
  }
}

test('two records made offline survive a reload and reach the server exactly once', async () => {
  const server = await startServer();
  try {
    const { ids, records } = await offlineJourney(server, { shots: true });
    assert.equal(records.length, 2);
    assert.deepEqual(records.map((r) => r.submission.client_id).sort(), [...ids].sort());
    for (const find of FINDS) {
      const record = records.find((r) => r.submission.species_guess === find.species);
      assert.ok(record, `record for ${find.species}`);
      assert.equal(record.photos.length, 1, 'its photo arrived with it');
      assert.equal(record.submission.length.value, Number(find.length));
      assert.equal(record.submission.position.source, 'device');
      assert.equal(record.submission.position.accuracy_m, 9);
    }
  } finally {
    server.stop();
  }
});

test('negative control: without the service worker the offline reload fails', async () => {
  const server = await startServer();
  try {
    await assert.rejects(offlineJourney(server, { serviceWorkers: 'block' }));
  } finally {
    server.stop();
  }
});

test('negative control: without the IndexedDB outbox nothing survives', async () => {
  const server = await startServer();
  try {
    await assert.rejects(offlineJourney(server, { withoutIndexedDb: true }));
    assert.equal((await server.records()).length, 0);
  } finally {
    server.stop();
  }
});
