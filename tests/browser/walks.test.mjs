// Survey walks on the phone, offline: a record made before the walk is added to it
// afterwards, a walk is started with "every find reported", the route is followed as
// the position moves, a record is made on the walk, the walk ends, the page is reloaded
// offline, and when the connection returns the server has one walk with its length,
// both records on it — and a record sent later can still be added to it.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { startServer, launchBrowser, phone, openOnPhone, eventually, sendNowAndWait } from './harness.mjs';

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

// Three fixes 0.00027° of latitude (about 30 m) apart, walking north from Borth.
const ROUTE = [[52.4890, -4.0530], [52.48927, -4.0530], [52.48954, -4.0530]];
// GeographicLib 2.1 (Karney 2013), Geodesic.WGS84.Inverse summed over ROUTE.
const ROUTE_M = 60.08938;

async function record(page, species) {
  await page.fill('#species', species);
  await page.selectOption('#condition', 'decomposed');
  await page.selectOption('#setting', 'beach_stranding');
  const before = await page.$$eval('.outbox-entry', (items) => items.length);
  await page.click('#save-send');
  await page.waitForFunction((n) => document.querySelectorAll('.outbox-entry').length === n + 1, before);
}

test('a walk made offline reaches the server once, with its route and its records', async () => {
  const server = await startServer();
  const context = await phone(browser, { latitude: ROUTE[0][0], longitude: ROUTE[0][1], accuracy: 6 });
  try {
    const page = await openOnPhone(context, server);
    await context.setOffline(true);

    await record(page, 'thornback ray');

    await page.click('#walk-start summary');
    await page.fill('#walk-stretch', 'Borth to Ynyslas');
    await page.check('#walk-all-finds');
    await page.click('#start-walk');
    await page.waitForSelector('#walk-active');
    await page.waitForFunction(() => /\b1 points on the route so far/.test(document.querySelector('#walk-progress')?.textContent));
    // Move along the route. The phone keeps at most one fix every 10 s, timed by the
    // browser's own position timestamps (a fake page clock does not move them), so each
    // next position is offered again until the phone keeps it.
    for (let fix = 1; fix < ROUTE.length; fix++) {
      const [latitude, longitude] = ROUTE[fix];
      const kept = new RegExp(`\\b${fix + 1} points on the route so far`);
      await eventually(`the phone keeps fix ${fix + 1} of the route`, async () => {
        await context.setGeolocation({ latitude, longitude, accuracy: 6 });
        return kept.test(await page.textContent('#walk-progress'));
      }, { timeout: 20000, every: 500 });
    }
    await record(page, 'small-spotted catshark');
    await page.click('#end-walk');
    await page.waitForSelector('.walk-entry');

    // The record made before the walk joins it, still offline.
    const early = page.locator('.outbox-entry', { hasText: 'thornback ray' });
    await early.locator('select.add-to-walk').selectOption({ index: 1 });
    await page.waitForFunction(() => document.querySelectorAll('.walk-link').length === 2);

    await page.reload();
    await page.waitForSelector('.walk-entry');
    // Not received: waiting, or marked sent by a round the reload cut short (it is sent again).
    assert.match(await page.textContent('.walk-entry'), /Borth to Ynyslas.*(waiting to send|sent, awaiting the server)/);
    assert.equal((await server.records()).length, 0);

    await context.setOffline(false);
    await page.waitForFunction(() => document.querySelector('.walk-entry')?.textContent.includes('received by the server')
      && [...document.querySelectorAll('.outbox-entry')].every((li) => li.textContent.includes('received by the server')), null, { timeout: 30000 });
    // Ask for another round: a walk sent again must stay one walk.
    await sendNowAndWait(page);

    const walks = await server.get('/api/walks');
    assert.equal(walks.length, 1, 'a walk sent twice is one walk');
    const [walk] = walks;
    assert.equal(walk.walk.stretch, 'Borth to Ynyslas');
    assert.equal(walk.walk.all_finds_reported, true);
    assert.equal(walk.walk.track.length, 3);
    const effort = await (await fetch(`${server.url}/api/effort?by=month`)).json();
    assert.ok(Math.abs(effort[0].kilometres * 1000 - ROUTE_M) < 0.01, JSON.stringify(effort));
    const records = await server.records();
    assert.equal(records.length, 2);
    assert.deepEqual([...walk.record_client_ids].sort(), records.map((r) => r.submission.client_id).sort());

    // A record already on the server can still be added to the walk.
    await record(page, 'spurdog');
    await page.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 15000 });
    const late = page.locator('.outbox-entry', { hasText: 'spurdog' });
    await late.locator('select.add-to-walk').selectOption({ index: 1 });
    await eventually('the server links the late record to the walk', async () => {
      const [w] = await server.get('/api/walks');
      return w.record_client_ids.length === 3;
    });
    // Once the server has linked it, the record still says it is on the walk and offers
    // no second link (which the server would refuse).
    await page.waitForFunction(() => {
      const entry = [...document.querySelectorAll('.outbox-entry')].find((li) => li.textContent.includes('spurdog'));
      return entry?.querySelector('.walk-link') && !entry.querySelector('select.add-to-walk');
    }, null, { timeout: 10000 });
    await page.reload();
    await page.waitForSelector('.outbox-entry');
    assert.match(await late.textContent(), /on a survey walk/, 'kept on the phone across a reload');
    assert.equal(await late.locator('select.add-to-walk').count(), 0);
  } finally {
    await context.close();
    server.stop();
  }
});
