// The review round trip across two browsers: an observer's phone records a find
// offline; a reviewer at a desk signs in and asks for detail; the question reaches the
// phone on its next sync; the observer answers offline with a new photo; the answer
// reaches the queue; the reviewer confirms; the phone shows "confirmed".
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { startServer, launchBrowser, demoPhoto, REVIEWER, ADMIN, phone, openOnPhone } from './harness.mjs';

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

const QUESTION = 'Can you photograph the underside of the head?';

test('a question reaches the phone, the answer with a photo reaches the reviewer, the phone sees confirmed', async () => {
  const server = await startServer();
  const handset = await phone(browser, { latitude: 52.4153, longitude: -4.0829, accuracy: 7 });
  const desk = await browser.newContext({ viewport: { width: 1100, height: 900 } });
  try {
    const observer = await openOnPhone(handset, server);
    await handset.setOffline(true);
    await observer.fill('#species', 'nursehound');
    await observer.selectOption('#condition', 'fresh_dead');
    await observer.selectOption('#setting', 'angler_catch');
    await observer.setInputFiles('#photo-input', demoPhoto('catshark.jpg'));
    await observer.waitForSelector('.thumbs img');
    await observer.click('#save-send');
    await observer.waitForSelector('.outbox-entry');
    await handset.setOffline(false);
    await observer.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 20000 });

    const reviewer = await desk.newPage();
    await reviewer.goto(`${server.url}/desk/#review`);
    await reviewer.fill('#username', REVIEWER.username);
    await reviewer.fill('#password', REVIEWER.password);
    await reviewer.click('#sign-in button[type=submit]');
    await reviewer.click('.queue-item button.link');
    await reviewer.waitForSelector('#record-review[data-state="awaiting_review"]');
    await reviewer.fill('#review-message', QUESTION);
    await reviewer.click('#ask-details');
    await reviewer.waitForSelector('#record-review[data-state="details_requested"]');

    await observer.click('#send-now');
    await observer.waitForFunction((q) => document.querySelector('#my-records')?.textContent.includes(q), QUESTION, { timeout: 15000 });
    assert.match(await observer.textContent('#my-records'), /a reviewer asked you something/);

    await handset.setOffline(true);
    assert.equal(await observer.getAttribute('.my-record details.answer', 'open'), '', 'a question waiting opens the answer box');
    await observer.fill('.my-record .answer-text', 'Here is the underside.');
    await observer.setInputFiles('.my-record .answer-photo', demoPhoto('spurdog.jpg'));
    // The photo is read for EXIF and made into its upload copy first, as a record's is.
    await observer.waitForSelector('.my-record .answer-thumb');
    await observer.click('.my-record .send-answer');
    await observer.waitForSelector('.answer-waiting');
    await observer.reload();
    await observer.waitForSelector('.answer-waiting', { timeout: 10000 });
    await handset.setOffline(false);
    await observer.waitForFunction(() => !document.querySelector('.answer-waiting'), null, { timeout: 20000 });

    await reviewer.click('text=← Back to the queue');
    await reviewer.click('.queue-item button.link');
    await reviewer.waitForSelector('#record-review[data-state="awaiting_review"]');
    assert.equal(await reviewer.$$eval('.review-photo', (imgs) => imgs.length), 2, 'the new photo is with the record');
    assert.match(await reviewer.textContent('.messages'), /Here is the underside/);
    await reviewer.fill('#confirm-name', 'Scyliorhinus stellaris');
    await reviewer.click('#confirm');
    await reviewer.waitForSelector('#record-review[data-state="confirmed"]');

    await observer.click('#send-now');
    await observer.waitForFunction(() => document.querySelector('.my-record .review-state')?.textContent === 'confirmed', null, { timeout: 15000 });
    assert.match(await observer.textContent('.my-record'), /Scyliorhinus stellaris/);

    const [record] = await server.records();
    assert.equal(record.review_state, 'confirmed');
    const detail = await server.get(`/api/review/records/${record.submission.client_id}`);
    assert.deepEqual(detail.events.map((e) => e.action), ['request_details', 'observer_reply', 'confirm']);
    // The answer's photo went as an upload copy (no EXIF of its own), with the phone's
    // reading of the original beside it (spurdog.jpg's tags, as exiftool reads them).
    const answered = detail.record.photos[1];
    assert.equal(answered.exif.taken_at, null);
    assert.equal(answered.phone_exif.taken_at, '2025-12-26T13:14:00Z');
    assert.deepEqual([answered.check.time_reading, answered.check.place_reading], ['phone', 'phone']);
  } finally {
    await handset.close();
    await desk.close();
    server.stop();
  }
});

test('an admin adds a reviewer, sets a new password and changes the role on the people screen, all in the trail; a reviewer cannot open it', async () => {
  const server = await startServer();
  const desk = await browser.newContext();
  try {
    const page = await desk.newPage();
    await page.goto(`${server.url}/desk/#review`);
    await page.fill('#username', ADMIN.username);
    await page.fill('#password', ADMIN.password);
    await page.click('#sign-in button[type=submit]');
    await page.click('a[href="#people"]');
    await page.fill('#new-username', 'gwen');
    await page.fill('#new-display-name', 'Gwen');
    await page.fill('#new-password', 'short');
    await page.click('#add-person');
    await page.waitForFunction(() => /at least 10 characters/.test(document.querySelector('#add-problem')?.textContent));
    await page.fill('#new-password', 'a long enough password');
    await page.click('#add-person');
    await page.waitForFunction(() => /gwen · reviewer · Gwen/.test(document.querySelector('#people-list')?.textContent));
    assert.match(await page.textContent('#add-note'), /^gwen was added as reviewer\./, 'adding a person says so');
    // A new password, set by the admin to hand over in person; then the old one fails.
    const gwen = page.locator('.person[data-username="gwen"]');
    await gwen.locator('.person-password').fill('a password handed over');
    await gwen.locator('.person-reset').click();
    await page.waitForFunction(() => /gwen has a new password/.test(document.querySelector('#people-note')?.textContent));
    const old = await fetch(`${server.url}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username: 'gwen', password: 'a long enough password' }) });
    assert.equal(old.status, 401);
    const login = await fetch(`${server.url}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username: 'gwen', password: 'a password handed over' }) });
    assert.equal(login.status, 200);
    // Every change is in the trail, with who made it.
    await page.waitForFunction(() => /gwen · password reset; their sign-ins ended · by browser-admin/.test(document.querySelector('#people-events')?.textContent));
    assert.match(await page.textContent('#people-events'), /gwen · added as reviewer · by browser-admin/);
    const cookie = login.headers.get('set-cookie').split(';')[0];
    const people = await fetch(`${server.url}/api/people`, { headers: { cookie } });
    assert.equal(people.status, 403, 'a reviewer cannot manage people');
    // Made an admin on the screen, the same sign-in may manage people at once.
    await gwen.locator('.person-role').selectOption('admin');
    await page.waitForFunction(() => /gwen is now admin/.test(document.querySelector('#people-note')?.textContent));
    assert.equal((await fetch(`${server.url}/api/people`, { headers: { cookie } })).status, 200);
    await page.waitForFunction(() => /gwen · role changed \(reviewer → admin\)/.test(document.querySelector('#people-events')?.textContent));
  } finally {
    await desk.close();
    server.stop();
  }
});

// Sends a record straight to the API, as a phone would.
async function send(server, record) {
  const form = new FormData();
  form.append('record', JSON.stringify(record));
  const response = await fetch(`${server.url}/api/observations`, { method: 'POST', body: form });
  assert.equal(response.status, 200, await response.text());
}

function carcass(clientId, day, north) {
  return {
    client_id: clientId, observed_at: `2025-06-0${1 + day}T09:00:00+01:00`,
    position: { latitude: 52.489 + north / 111300, longitude: -4.053, accuracy_m: 10, source: 'device' },
    species_guess: 'thornback ray', length: { kind: 'disc_width', value: 50, unit: 'cm', method: 'measured' },
    sex: 'unknown', count: 1, condition: day === 0 ? 'fresh_dead' : 'decomposed', setting: 'beach_stranding',
    human_signs: [], notes: null, observer_name: `Walker ${day + 1}`,
  };
}

test('a reviewer sees two reports of one carcass side by side, merges them, and undoes it', async () => {
  const server = await startServer();
  const desk = await browser.newContext({ viewport: { width: 1100, height: 900 } });
  try {
    await send(server, carcass('e0000000-0000-4000-8000-000000000001', 0, 0));
    await send(server, carcass('e0000000-0000-4000-8000-000000000002', 1, 300));
    const page = await desk.newPage();
    await page.goto(`${server.url}/desk/#review`);
    await page.fill('#username', REVIEWER.username);
    await page.fill('#password', REVIEWER.password);
    await page.click('#sign-in button[type=submit]');
    await page.waitForSelector('.queue-item');
    assert.match(await page.textContent('#queue'), /possibly the same animal/);
    await page.click('.queue-item[data-client-id="e0000000-0000-4000-8000-000000000002"] button.link');
    await page.waitForSelector('.duplicate');
    assert.match(await page.textContent('.duplicate'), /300 m apart · 24\.0 h apart/);
    await page.click('.duplicate .same-animal');
    await page.waitForSelector('#record-review[data-state="merged"]');
    await page.waitForSelector('.undo-merge');
    // Both reports await review, so every state is asked for (public exports default to confirmed records).
    const csv = await (await fetch(`${server.url}/api/export?format=csv&state=any`)).text();
    assert.equal(csv.trim().split('\n').length, 2, 'the export counts the animal once');
    await page.click('.undo-merge');
    await page.waitForSelector('#record-review[data-state="awaiting_review"]');
    // Undone exactly: the pair is a candidate again, undecided, with both choices offered.
    await page.waitForSelector('.duplicate .same-animal');
    assert.doesNotMatch(await page.textContent('.duplicate'), /Decided/);
    assert.equal(await page.$$eval('.duplicate .different-animals', (b) => b.length), 1);
    const queue = await server.get('/api/review/queue');
    assert.equal(queue.filter((item) => item.priority_reasons.some((r) => /possibly the same animal/.test(r.text))).length, 2, 'both back in the queue as possible duplicates');
  } finally {
    await desk.close();
    server.stop();
  }
});
