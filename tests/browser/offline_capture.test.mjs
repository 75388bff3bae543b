// The walking skeleton end to end: a phone with no signal records two finds with
// photos, the page is reloaded while still offline (the app and its outbox must
// survive), the connection returns, and the server holds each record exactly once.
//
// Two negative controls show the test can fail, each at the step it is about: with the
// service worker blocked the offline reload cannot open the app, and with IndexedDB taken
// away the phone refuses to save the record. The journey stops with a `JourneyStopped`
// naming its step, and each control checks that it stopped there, for that reason.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { startServer, launchBrowser, screenshotPath, demoPhoto, sendNowAndWait } from './harness.mjs';

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

const FINDS = [
  { species: 'small-spotted catshark', length: '54', condition: 'fresh_dead', setting: 'beach_stranding', photo: 'catshark.jpg' },
  { species: 'thornback ray', length: '47', condition: 'decomposed', setting: 'beach_stranding', photo: 'ray.jpg' },
];

// The steps of the journey a negative control may stop at.
const STEP = {
  save: 'save the record in the outbox while offline',
  reload: 'reload the app while offline',
};

// The journey did not get past `step`; `detail` says what the page showed instead.
class JourneyStopped extends Error {
  constructor(step, detail) {
    super(`${step}: ${detail}`);
    this.name = 'JourneyStopped';
    this.step = step;
  }
}

// Fills the form and saves; resolves once the outbox lists `expected` entries, or throws
// JourneyStopped with the phone's own words when it says the record was not saved.
async function saveRecord(page, find, expected) {
  await page.fill('#species', find.species);
  await page.fill('#length', find.length);
  await page.selectOption('#condition', find.condition);
  await page.selectOption('#setting', find.setting);
  await page.setInputFiles('#photo-input', demoPhoto(find.photo));
  await page.waitForSelector('.thumbs img');
  // The demo photos were taken months ago elsewhere on the coast: keep the phone's own
  // time and place for this record (the photo's would be offered instead).
  await page.click('#keep-device-time');
  await page.click('#save-send');
  const outcome = await page.waitForFunction((n) => {
    if (document.querySelectorAll('.outbox-entry').length === n) return 'saved';
    const note = document.querySelector('#saved-note')?.textContent ?? '';
    return note.startsWith('Could not save') ? note : null;
  }, expected, { timeout: 8000 });
  const said = await outcome.jsonValue();
  if (said !== 'saved') throw new JourneyStopped(STEP.save, said);
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
    await page.waitForFunction(() => document.querySelector('#position-note')?.textContent.includes('within'), null, { timeout: 10000 });

    await context.setOffline(true);
    for (const [index, find] of FINDS.entries()) await saveRecord(page, find, index + 1);
    if (shots) await page.screenshot({ path: screenshotPath('offline-two-records'), fullPage: true });

    try {
      await page.reload({ timeout: 10000 });
    } catch (err) {
      throw new JourneyStopped(STEP.reload, err.message.split('\n')[0]);
    }
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
    await sendNowAndWait(page);
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
    // Without the worker's cache the browser has nothing to show offline.
    await assert.rejects(offlineJourney(server, { serviceWorkers: 'block' }),
      { name: 'JourneyStopped', step: STEP.reload, message: /net::ERR_INTERNET_DISCONNECTED/ });
  } finally {
    server.stop();
  }
});

test('negative control: without IndexedDB the phone refuses to save, saying why', async () => {
  const server = await startServer();
  try {
    await assert.rejects(offlineJourney(server, { withoutIndexedDb: true }), {
      name: 'JourneyStopped',
      step: STEP.save,
      message: /Could not save on this phone: this browser offers no offline storage \(IndexedDB\)\. Your form is kept/,
    });
    assert.equal((await server.records()).length, 0);
  } finally {
    server.stop();
  }
});
