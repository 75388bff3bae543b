// The live-animal path on a 390 px phone, offline and then online: saying the animal
// is alive puts the cautions, then the call button with the operator's responders'
// number, then what to do, above the rest of the form before saving; the record waits
// marked "sent first" through a reload in flight mode; when the connection comes back it
// reaches the server before an older record, and the responders' webhook (a small HTTP
// receiver here on 127.0.0.1) hears of it once.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import http from 'node:http';
import { startServer, launchBrowser, phone, openOnPhone, eventually, screenshotPath } from './harness.mjs';

const RESPONDERS = '0800 000 0000 (invented demo stranding line)';
const HOME = { latitude: 52.4153, longitude: -4.0829, accuracy: 7 };

let browser;
let server;
let receiver;
const alerts = [];

before(async () => {
  browser = await launchBrowser();
  receiver = http.createServer((request, response) => {
    let body = '';
    request.on('data', (chunk) => { body += chunk; });
    request.on('end', () => {
      alerts.push({ headers: request.headers, body: JSON.parse(body) });
      response.writeHead(204).end();
    });
  });
  await new Promise((resolve) => receiver.listen(0, '127.0.0.1', resolve));
  server = await startServer({
    env: {
      WRACKLINE_RESPONDERS_PHONE: RESPONDERS,
      WRACKLINE_RESPONDERS_WEBHOOK: `http://127.0.0.1:${receiver.address().port}/alerts`,
      WRACKLINE_RESPONDERS_WEBHOOK_SECRET: 'browser-test-secret',
      WRACKLINE_NOTIFY_FIRST_RETRY_MS: '200',
    },
  });
});
after(async () => {
  await browser?.close();
  server?.stop();
  receiver?.close();
});

async function save(page, species, condition) {
  await page.fill('#species', species);
  if (condition) await page.selectOption('#condition', condition);
  await page.selectOption('#setting', 'beach_stranding');
  const before = await page.$$eval('.outbox-entry', (items) => items.length);
  await page.click('#save-send');
  await page.waitForFunction((n) => document.querySelectorAll('.outbox-entry').length === n + 1, before);
}

test('a live animal: cautions, then the call, above the form; sent first when the connection comes back', async () => {
  const context = await phone(browser, HOME);
  try {
    const page = await openOnPhone(context, server);
    await context.setOffline(true);
    await save(page, 'small-spotted catshark', 'decomposed');

    assert.equal(await page.locator('#live-animal').count(), 0, 'no panel until the animal is said to be alive');
    await page.click('#it-is-alive');
    await page.waitForSelector('#live-animal');
    assert.equal(await page.inputValue('#condition'), 'alive', 'the button sets the condition');
    const order = await page.evaluate(() => {
      const y = (selector) => document.querySelector(selector).getBoundingClientRect().top;
      return { cautions: y('#live-cautions'), call: y('#call-responders'), steps: y('#live-steps'), photos: y('#record-form fieldset, #record-form .photo-picker') };
    });
    assert.ok(order.cautions < order.call && order.call < order.steps, `cautions, then the call, then the steps: ${JSON.stringify(order)}`);
    assert.ok(order.steps < order.photos, `the panel stands above the rest of the form: ${JSON.stringify(order)}`);
    const call = page.locator('#call-responders');
    assert.equal(await call.getAttribute('href'), 'tel:08000000000');
    assert.match(await call.textContent(), /Call the responders: 0800 000 0000 \(invented demo stranding line\)/);
    assert.match(await page.textContent('#live-cautions'), /Keep back.*push it back to sea unless you are trained.*responders' directions/s);
    const box = await call.boundingBox();
    assert.ok(box.height >= 44, `a call button a wet thumb can hit: ${box.height} px`);
    assert.ok(await page.evaluate(() => document.documentElement.scrollWidth <= 390), 'nothing wider than the phone');
    await page.screenshot({ path: screenshotPath('live-animal-panel') });

    await save(page, 'thornback ray', null);
    assert.match(await page.textContent('#saved-note'), /goes to the responders before anything else/);
    await page.reload();
    await page.waitForSelector('.outbox-entry');
    const live = page.locator('.outbox-entry', { hasText: 'thornback ray' });
    assert.match(await live.textContent(), /live animal: sent first/);
    assert.equal((await server.records()).length, 0);
    assert.equal(alerts.length, 0);

    await context.setOffline(false);
    await page.waitForFunction(() => [...document.querySelectorAll('.outbox-entry')].every((li) => li.textContent.includes('received by the server')), null, { timeout: 30000 });
    const records = await server.records();
    const byGuess = Object.fromEntries(records.map((r) => [r.submission.species_guess, r.observation_id]));
    assert.ok(byGuess['thornback ray'] < byGuess['small-spotted catshark'], `the live animal was stored first: ${JSON.stringify(byGuess)}`);
    const alert = await eventually('the responders hear of the live animal', () => alerts.find((a) => a.body.species_guess === 'thornback ray'));
    assert.equal(alert.body.event, 'live_animal');
    assert.match(alert.headers['x-wrackline-signature'], /^sha256=[0-9a-f]{64}$/);
    assert.equal(alerts.filter((a) => a.body.species_guess === 'small-spotted catshark').length, 0, 'a dead animal is no alert');
  } finally {
    await context.close();
  }
});
