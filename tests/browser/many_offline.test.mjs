// A long day with no signal: 200 records, each with a photo, captured offline on one
// phone; the app is reloaded twice while still offline (the outbox must keep all 200);
// then the connection returns and the phone sends them. The server holds exactly 200
// records — the phone's own ids, none doubled, each with its photo — and another round
// of sending changes nothing.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { startServer, launchBrowser, demoPhoto, phone, openOnPhone, eventually, sendNowAndWait } from './harness.mjs';

const RECORDS = 200;
const PHOTOS = ['catshark.jpg', 'ray.jpg', 'spurdog.jpg', 'tope.jpg', 'stingray.jpg'];
const SPECIES = ['small-spotted catshark', 'thornback ray', 'spurdog', 'tope', 'common stingray'];

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

const entries = (page) => page.$$eval('.outbox-entry', (items) => items.map((li) => ({ id: li.dataset.clientId, text: li.textContent })));

async function capture(page, index) {
  await page.fill('#species', SPECIES[index % SPECIES.length]);
  await page.fill('#length', String(40 + (index % 60)));
  await page.selectOption('#condition', 'fresh_dead');
  await page.selectOption('#setting', 'beach_stranding');
  await page.fill('#notes', `find ${index + 1} of the day`);
  await page.setInputFiles('#photo-input', demoPhoto(PHOTOS[index % PHOTOS.length]));
  await page.waitForSelector('.thumbs img');
  await page.click('#save-send');
  await page.waitForFunction((n) => document.querySelectorAll('.outbox-entry').length === n, index + 1, { timeout: 10000 });
}

test('200 records with photos made offline survive two reloads and reach the server once each', { timeout: 600000 }, async () => {
  const server = await startServer();
  const context = await phone(browser, { latitude: 52.4153, longitude: -4.0829, accuracy: 9 });
  try {
    const page = await openOnPhone(context, server);
    await page.waitForFunction(() => document.querySelector('#position-note')?.textContent.includes('±'), null, { timeout: 10000 });
    await context.setOffline(true);
    for (let index = 0; index < RECORDS; index += 1) await capture(page, index);
    const captured = (await entries(page)).map((e) => e.id);
    assert.equal(new Set(captured).size, RECORDS, 'each record has its own id');

    for (const reload of [1, 2]) {
      await page.reload({ timeout: 20000 });
      await page.waitForFunction((n) => document.querySelectorAll('.outbox-entry').length === n, RECORDS, { timeout: 30000 });
      const kept = await entries(page);
      assert.deepEqual(kept.map((e) => e.id).sort(), [...captured].sort(), `reload ${reload}: the outbox keeps every record`);
      assert.ok(kept.every((e) => e.text.includes('waiting to send')), `reload ${reload}: all still waiting`);
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
