// A long day with no signal: 200 records, each with a photo, captured offline on one
// phone; the app is reloaded twice while still offline (the outbox must keep all 200);
// then the connection returns and the phone sends them. The server holds exactly 200
// records — the phone's own ids, none doubled, each with its photo — and another round
// of sending changes nothing.
//
// The records are captured through the form itself, with the events a person's typing
// and picking fire (input, change, a file given to the photo input), run in a loop inside
// the page so that 200 records take seconds rather than minutes of round trips.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { startServer, launchBrowser, demoPhoto, phone, openOnPhone, eventually, sendNowAndWait } from './harness.mjs';

const RECORDS = 200;
const PHOTOS = ['catshark.jpg', 'ray.jpg', 'spurdog.jpg', 'tope.jpg', 'stingray.jpg'];
const SPECIES = ['small-spotted catshark', 'thornback ray', 'spurdog', 'tope', 'common stingray'];

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

const entries = (page) => page.$$eval('.outbox-entry', (items) => items.map((li) => ({ id: li.dataset.clientId, text: li.textContent })));

// Fills and saves the form `count` times in the page, a demo photo with each record.
async function captureAll(page, count) {
  const photos = PHOTOS.map((name) => readFileSync(demoPhoto(name)).toString('base64'));
  await page.evaluate(async ({ photos, species, count }) => {
    const bytes = photos.map((b64) => Uint8Array.from(atob(b64), (c) => c.charCodeAt(0)));
    const until = async (what, done) => {
      const deadline = performance.now() + 10000;
      while (!done()) {
        if (performance.now() > deadline) throw new Error(`${what}: not within 10 s`);
        await new Promise((resolve) => setTimeout(resolve, 2));
      }
    };
    const type = (selector, value) => {
      const field = document.querySelector(selector);
      field.value = value;
      field.dispatchEvent(new Event('input', { bubbles: true }));
      field.dispatchEvent(new Event('change', { bubbles: true }));
    };
    for (let index = 0; index < count; index += 1) {
      type('#species', species[index % species.length]);
      type('#length', String(40 + (index % 60)));
      type('#condition', 'fresh_dead');
      type('#setting', 'beach_stranding');
      type('#notes', `find ${index + 1} of the day`);
      const picked = new DataTransfer();
      picked.items.add(new File([bytes[index % bytes.length]], `find-${index + 1}.jpg`, { type: 'image/jpeg' }));
      const input = document.querySelector('#photo-input');
      input.files = picked.files;
      input.dispatchEvent(new Event('change', { bubbles: true }));
      await until(`record ${index + 1}: its photo shows`, () => document.querySelectorAll('.thumbs img').length === 1);
      document.querySelector('#save-send').click();
      await until(`record ${index + 1}: saved in the outbox`, () => document.querySelectorAll('.outbox-entry').length === index + 1);
    }
  }, { photos, species: SPECIES, count });
}

test('200 records with photos made offline survive two reloads and reach the server once each', { timeout: 600000 }, async () => {
  const server = await startServer();
  const context = await phone(browser, { latitude: 52.4153, longitude: -4.0829, accuracy: 9 });
  try {
    const page = await openOnPhone(context, server);
    await page.waitForFunction(() => /within/.test(document.querySelector('#position-note')?.textContent), null, { timeout: 10000 });
    await context.setOffline(true);
    await captureAll(page, RECORDS);
    const captured = (await entries(page)).map((e) => e.id);
    assert.equal(new Set(captured).size, RECORDS, 'each record has its own id');

    for (const reload of [1, 2]) {
      await page.reload({ timeout: 20000 });
      await page.waitForFunction((n) => document.querySelectorAll('.outbox-entry').length === n, RECORDS, { timeout: 30000 });
      const kept = await entries(page);
      assert.deepEqual(kept.map((e) => e.id).sort(), [...captured].sort(), `reload ${reload}: the outbox keeps every record`);
      // The app tries to send after a reload; offline, each is waiting or on its way, none received.
      const unsent = kept.filter((e) => e.text.includes('waiting to send') || e.text.includes('sent, awaiting the server'));
      assert.equal(unsent.length, RECORDS, `reload ${reload}: all still to be received`);
    }
    assert.equal((await server.records()).length, 0, 'nothing reaches the server while offline');

    await context.setOffline(false);
    await page.waitForFunction(
      (n) => [...document.querySelectorAll('.outbox-entry')].filter((li) => li.textContent.includes('received by the server')).length === n,
      RECORDS, { timeout: 300000 },
    );
    await sendNowAndWait(page);
    const records = await eventually('the server holds the 200 records', async () => {
      const stored = await server.records();
      return stored.length >= RECORDS ? stored : null;
    });
    const ids = records.map((r) => r.submission.client_id);
    assert.equal(records.length, RECORDS, 'exactly 200, after another round of sending');
    assert.equal(new Set(ids).size, RECORDS, 'none doubled');
    assert.deepEqual([...ids].sort(), [...captured].sort(), 'the phone\'s own ids');
    assert.ok(records.every((r) => r.photos.length === 1), 'each with its photo');
  } finally {
    await context.close();
    server.stop();
  }
});
