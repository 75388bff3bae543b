// A reviewer's path on a 390 px phone, each test failing on one of the trips reviewers
// met: a second tab (or a restarted browser) that looked signed in but got 403 on every
// action and could not sign out; the observer's contact stored but shown nowhere; a
// heading that kept the observer's guess after the identification changed; filters
// filling the first screen; a when/where table wider than the phone; and an error shown
// thousands of pixels from the button that caused it.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import {
  startServer, launchBrowser, screenshotPath, REVIEWER, phone, openOnPhone, plainRecord, sendRecord,
} from './harness.mjs';

const PHONE = { width: 390, height: 844 };
const id = (n) => `d0000000-0000-4000-8000-${String(n).padStart(12, '0')}`;

let browser;
let server;
before(async () => {
  browser = await launchBrowser();
  server = await startServer();
  for (let n = 1; n <= 3; n++) await sendRecord(server, plainRecord(id(n), 'thornback ray', { hoursAgo: n }));
});
after(async () => {
  await browser?.close();
  server?.stop();
});

async function signIn(page) {
  await page.goto(`${server.url}/desk/#review`);
  await page.fill('#username', REVIEWER.username);
  await page.fill('#password', REVIEWER.password);
  await page.click('#sign-in button[type=submit]');
  await page.waitForSelector('.queue-item', { timeout: 15000 });
}

async function openRecord(page, clientId) {
  await page.click(`.queue-item[data-client-id="${clientId}"] button.link`);
  await page.waitForSelector('#record-review');
}

test('a second tab and a restarted browser act and sign out without 403', async () => {
  const desk = await browser.newContext({ viewport: PHONE });
  try {
    const first = await desk.newPage();
    await signIn(first);
    // A second tab shares the cookie but not the first tab's sessionStorage.
    const second = await desk.newPage();
    await second.goto(`${server.url}/desk/#review`);
    await second.waitForSelector('.queue-item', { timeout: 15000 });
    await openRecord(second, id(1));
    await second.fill('#review-message', 'Which beach was it on?');
    await second.click('#ask-details');
    await second.waitForSelector('#record-review[data-state="details_requested"]');
    assert.equal(await second.textContent('#decide-problem'), '');

    // The browser restarts: cookies kept, sessionStorage gone.
    const restarted = await browser.newContext({ viewport: PHONE, storageState: await desk.storageState() });
    try {
      const page = await restarted.newPage();
      await page.goto(`${server.url}/desk/#review`);
      await page.waitForSelector('.queue-item', { timeout: 15000 });
      await openRecord(page, id(2));
      await page.fill('#review-message', 'No photo of the underside?');
      await page.click('#not-confirmable');
      await page.waitForSelector('#record-review[data-state="not_confirmable"]');
      await page.click('text=← Back to the queue');
      await page.click('#queue-sign-out');
      await page.waitForSelector('#sign-in');
      const session = await page.evaluate(async () => (await fetch('/api/session')).json());
      assert.equal(session.signed_in, false, 'signed out on the server, not only on screen');
    } finally {
      await restarted.close();
    }
  } finally {
    await desk.close();
  }
});

test('the record shows the observer\'s contact and a heading with the current identification; the screen fits the phone', async () => {
  // An observer who gave a name and contact in About you.
  const handset = await phone(browser, { latitude: 52.4153, longitude: -4.0829, accuracy: 7 });
  const desk = await browser.newContext({ viewport: PHONE });
  try {
    const observer = await openOnPhone(handset, server);
    await observer.fill('#species', 'contact catshark');
    await observer.selectOption('#condition', 'fresh_dead');
    await observer.selectOption('#setting', 'beach_stranding');
    await observer.click('#save-send');
    await observer.waitForSelector('#about-you[open]', { timeout: 15000 });
    await observer.fill('#about-name', 'Gwen Invented');
    await observer.fill('#about-contact', 'gwen@example.org');
    await observer.click('#about-save');
    await observer.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 20000 });
    await observer.click('#send-now');
    const sent = (await server.records()).find((r) => r.submission.species_guess === 'contact catshark');

    const page = await desk.newPage();
    await signIn(page);
    // The filters fold away: the first record is on the first screen.
    assert.equal(await page.getAttribute('#filters-fold', 'open'), null, 'filters folded on a phone');
    const firstItem = await page.$eval('.queue-item', (li) => li.getBoundingClientRect().top);
    assert.ok(firstItem < PHONE.height, `the first record is on the first screen (at ${firstItem} px)`);
    await page.screenshot({ path: screenshotPath('reviewer-queue'), fullPage: true });
    await page.waitForFunction((clientId) => document.querySelector(`.queue-item[data-client-id="${clientId}"]`), sent.submission.client_id);
    await openRecord(page, sent.submission.client_id);
    await page.waitForFunction(() => /gwen@example\.org/.test(document.querySelector('#observer-contact')?.textContent), null, { timeout: 15000 });
    assert.match(await page.textContent('#observer-contact'), /Sent by Gwen Invented · gwen@example\.org/);
    assert.match(await page.textContent('#record-heading'), /^contact catshark · awaiting review/);
    await page.fill('#confirm-name', 'Scyliorhinus stellaris');
    await page.click('#confirm');
    await page.waitForSelector('#record-review[data-state="confirmed"]');
    assert.match(await page.textContent('#record-heading'), /^nursehound \(Scyliorhinus stellaris\) · confirmed/);
    assert.match(await page.textContent('#record-review'), /Observer's guess: contact catshark/);
    const table = await page.$eval('.when-where', (t) => ({ scroll: t.scrollWidth, client: t.clientWidth, right: t.getBoundingClientRect().right }));
    assert.ok(table.scroll <= table.client + 1 && table.right <= PHONE.width, `the when/where table fits: ${JSON.stringify(table)}`);
    await page.screenshot({ path: screenshotPath('reviewer-record'), fullPage: true });
  } finally {
    await handset.close();
    await desk.close();
  }
});

test('an error is shown right under the button that caused it', async () => {
  const desk = await browser.newContext({ viewport: PHONE });
  try {
    const page = await desk.newPage();
    await signIn(page);
    await openRecord(page, id(3));
    // Confirming with no name is refused by the server.
    await page.fill('#confirm-name', '');
    await page.click('#confirm');
    await page.waitForFunction(() => document.querySelector('#decide-problem')?.textContent.length > 0, null, { timeout: 10000 });
    const [button, words] = await Promise.all(['#confirm', '#decide-problem'].map((s) => page.$eval(s, (el) => el.getBoundingClientRect().top + scrollY)));
    assert.ok(Math.abs(words - button) < 400, `the error is ${Math.round(words - button)} px from the button`);
    await page.$eval('#decide-problem', (el) => el.scrollIntoView());
    await page.screenshot({ path: screenshotPath('reviewer-error') });
  } finally {
    await desk.close();
  }
});
