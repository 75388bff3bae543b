// The reviewer's screens beyond the round trip: the queue's filters (state, species or
// higher taxon — downward, so a genus record is found by its family —, area, dates,
// flag) and its pages; a record sent from a phone shows the phone's own EXIF reading
// of the original (the upload copy carries none), each photo's gap and distance from
// the record with its flags; and a photo opens large and zooms, with the buttons on a
// desk and with two fingers on a phone.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { startServer, launchBrowser, demoPhoto, REVIEWER, phone, openOnPhone } from './harness.mjs';

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

// Sends a record straight to the API, as a phone would.
async function send(server, record) {
  const form = new FormData();
  form.append('record', JSON.stringify(record));
  const response = await fetch(`${server.url}/api/observations`, { method: 'POST', body: form });
  assert.equal(response.status, 200, await response.text());
}

function record(clientId, guess, observedAt, latitude, longitude) {
  return {
    client_id: clientId, observed_at: observedAt,
    position: { latitude, longitude, accuracy_m: 10, source: 'device' },
    species_guess: guess, length: null, sex: 'unknown', count: 1, condition: 'decomposed',
    setting: 'beach_stranding', human_signs: [], notes: null, observer_name: 'Invented Walker',
  };
}

const id = (n) => `f0000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
const CAT = id(901);
const NURSE = id(902);
const GENUS = id(903);
const DUP1 = id(904);
const DUP2 = id(905);
const FILLERS = 55;

// Signs in over HTTP for set-up calls: the cookie and the CSRF token.
async function signInApi(server) {
  const response = await fetch(`${server.url}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(REVIEWER) });
  const body = await response.json();
  return { cookie: response.headers.get('set-cookie').split(';')[0], csrf: body.csrf_token };
}

async function signInPage(page, server) {
  page.on('pageerror', (err) => console.error('page error:', err.message));
  page.on('console', (msg) => { if (msg.type() === 'error') console.error('console:', msg.text()); });
  await page.goto(`${server.url}/desk/#review`);
  await page.fill('#username', REVIEWER.username);
  await page.fill('#password', REVIEWER.password);
  await page.click('#sign-in button[type=submit]');
  await page.waitForSelector('#queue-filters');
}

async function queueShows(page, count) {
  await page.waitForFunction((n) => document.querySelectorAll('#queue .queue-item').length === n, count, { timeout: 10000 })
    .catch(async (e) => { console.log('QUEUE', await page.textContent('#queue'), await page.textContent('.review')); throw e; });
}

const shownIds = (page) => page.$$eval('#queue .queue-item', (items) => items.map((li) => li.dataset.clientId).sort());

test('the queue filters by taxon (downward), area, dates and flag, and comes in pages', async () => {
  const server = await startServer();
  const desk = await browser.newContext({ viewport: { width: 1100, height: 900 } });
  try {
    // Fillers ten days apart along Cardigan Bay (never the same animal), then the ones
    // the filters should find. Positions as in demo-records/checklist.json's areas.
    for (let n = 0; n < FILLERS; n++) {
      const day = new Date(Date.UTC(2023, 0, 1) + n * 10 * 86400000).toISOString().slice(0, 10);
      await send(server, record(id(n), 'thornback ray', `${day}T10:00:00Z`, 52.0 + n * 0.014, -4.3));
    }
    await send(server, record(CAT, 'small-spotted catshark', '2025-03-01T10:00:00Z', 52.4, -4.1));
    await send(server, record(NURSE, 'nursehound', '2025-04-01T10:00:00Z', 53.5, 1.0));
    await send(server, record(GENUS, 'a spotted catshark of some kind', '2025-05-01T10:00:00Z', 52.2, -4.2));
    await send(server, record(DUP1, 'blonde ray', '2025-06-01T08:00:00Z', 52.3, -4.15));
    await send(server, record(DUP2, 'blonde ray', '2025-06-01T10:00:00Z', 52.3005, -4.15));
    const staff = await signInApi(server);
    const confirmed = await fetch(`${server.url}/api/review/records/${GENUS}/actions`, {
      method: 'POST', headers: { 'content-type': 'application/json', cookie: staff.cookie, 'x-csrf-token': staff.csrf },
      body: JSON.stringify({ action: 'confirm', scientific_name: 'Scyliorhinus', taxon_rank: 'genus', remark: 'spots seen, not the nasal flaps' }),
    });
    assert.equal(confirmed.status, 200);

    const page = await desk.newPage();
    await signInPage(page, server);
    // 55 fillers + 4 to review (the genus record is confirmed): a first page of 50.
    await queueShows(page, 50);
    assert.match(await page.textContent('#queue-count'), /50 record\(s\), more below/);
    await page.click('#queue-more');
    await queueShows(page, 59);
    assert.equal(await page.$('#queue-more'), null, 'nothing more to load');

    // A new filter starts again from the first page.
    await page.selectOption('#queue-state', 'any');
    await page.waitForFunction(() => /^50 record\(s\), more below/.test(document.querySelector('#queue-count')?.textContent));
    await page.click('#queue-more');
    await queueShows(page, 60);
    await page.fill('#queue-taxon', 'Scyliorhinidae');
    await page.click('#queue-apply');
    await queueShows(page, 3);
    assert.deepEqual(await shownIds(page), [CAT, NURSE, GENUS].sort(), 'the family finds its species and the record named only to a genus');
    await page.fill('#queue-taxon', 'Scyliorhinus canicula');
    await page.click('#queue-apply');
    await queueShows(page, 1);
    assert.deepEqual(await shownIds(page), [CAT]);

    await page.click('#queue-clear');
    await queueShows(page, 50);
    await page.selectOption('#queue-area', 'north-sea');
    await queueShows(page, 1);
    assert.deepEqual(await shownIds(page), [NURSE]);
    await page.selectOption('#queue-area', '');
    await page.fill('#queue-from', '2025-02-15');
    await page.fill('#queue-to', '2025-03-15');
    await page.click('#queue-apply');
    await queueShows(page, 1);
    assert.deepEqual(await shownIds(page), [CAT]);

    await page.click('#queue-clear');
    await page.selectOption('#queue-flag', 'possible_duplicate');
    await queueShows(page, 2);
    assert.deepEqual(await shownIds(page), [DUP1, DUP2].sort());
    assert.match(await page.textContent('#queue'), /possibly the same animal/);
  } finally {
    await desk.close();
    server.stop();
  }
});

test("a phone's record shows the phone's EXIF reading and photo checks; photos open large and zoom", async () => {
  const server = await startServer();
  // 1.7 km from where catshark.jpg's own GPS says it was taken (52.43009, -4.07699).
  const handset = await phone(browser, { latitude: 52.4153, longitude: -4.0829, accuracy: 7 });
  const desk = await browser.newContext({ viewport: { width: 1100, height: 900 } });
  try {
    const observer = await openOnPhone(handset, server);
    await observer.fill('#species', 'small-spotted catshark');
    await observer.selectOption('#condition', 'fresh_dead');
    await observer.selectOption('#setting', 'beach_stranding');
    await observer.setInputFiles('#photo-input', demoPhoto('catshark.jpg'));
    await observer.waitForSelector('.thumbs img');
    // The walker keeps this phone's time and place: the photo, months old, is then flagged.
    await observer.click('#keep-device-time');
    await observer.click('#save-send');
    await observer.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 20000 });
    // The first sync asks, once and optionally, for a name and a contact.
    await observer.waitForSelector('#about-you');
    assert.match(await observer.textContent('#about-you'), /never published, never exported/);
    await observer.fill('#about-name', 'Invented Walker');
    await observer.fill('#about-contact', 'walker@example.org');
    await observer.click('#about-save');
    await observer.waitForFunction(() => /^Saved: /.test(document.querySelector('#about-note')?.textContent));

    const page = await desk.newPage();
    await signInPage(page, server);
    await page.selectOption('#queue-flag', 'taken_long_before_record');
    await queueShows(page, 1);
    assert.match(await page.textContent('#queue'), /photo older than the record: photo 1 was taken .* days before it/);
    await page.click('.queue-item button.link');
    await page.waitForSelector('#record-review');
    // How the name reads against the checklist, and where the public sees the record because of it.
    assert.match(await page.textContent('#name-reading'), /Scyliorhinus canicula \(species\): matched .*Public place: .*0\.1 degree .*not yet confirmed/);
    // The upload copy carries no EXIF: the row is the phone's reading of the original
    // (the times and place exiftool reads from catshark.jpg).
    assert.equal(await page.$('.exif-file'), null);
    const phoneRow = await page.textContent('.exif-phone');
    assert.match(phoneRow, /photo 1 \(the phone's reading of the original\)/);
    assert.match(phoneRow, /2026-07-18 13:18 \+01:00/);
    assert.match(phoneRow, /52\.4300\d, -4\.0769\d/);
    const check = await page.textContent('.photo-check');
    assert.match(check, /the phone's reading of the original/);
    assert.match(check, /days before the record/);
    assert.match(check, /1\.\d km from the record's place/);
    assert.match(check, /photo older than the record/);
    assert.match(check, /photo far from the record/);

    // Zoom with the buttons; the original is there for reviewers.
    await page.click('.photo-open');
    await page.waitForSelector('#photo-zoom');
    assert.equal(await page.textContent('#zoom-level'), '100%');
    await page.click('#zoom-in');
    await page.click('#zoom-in');
    assert.equal(await page.textContent('#zoom-level'), '156%');
    assert.match(await page.getAttribute('#zoom-image', 'style'), /scale\(1\.56[23]\)/);
    const original = await page.getAttribute('#zoom-original', 'href');
    assert.match(original, /^\/photos\/[0-9a-f]{64}\/original$/);
    assert.equal(await page.evaluate(async (href) => (await fetch(href)).status, original), 200, 'the signed-in reviewer gets the original');
    assert.equal((await fetch(`${server.url}${original}`)).status, 401, 'nobody else does');
    await page.click('#zoom-out');
    await page.click('#zoom-fit');
    assert.equal(await page.textContent('#zoom-level'), '100%');
    await page.click('#zoom-close');
    await page.waitForSelector('#photo-zoom', { state: 'detached' });

    // On a phone-sized screen, two fingers moving apart zoom in.
    const small = await browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true, storageState: await desk.storageState() });
    try {
      const onPhone = await small.newPage();
      await onPhone.goto(`${server.url}/desk/#review`);
      await onPhone.click('.queue-item button.link');
      await onPhone.click('.photo-open');
      await onPhone.waitForSelector('.zoom-stage');
      await onPhone.evaluate(() => {
        const stage = document.querySelector('.zoom-stage');
        const fire = (type, pointerId, x) => stage.dispatchEvent(new PointerEvent(type, { pointerId, clientX: x, clientY: 400, pointerType: 'touch', isPrimary: pointerId === 1, bubbles: true, cancelable: true }));
        fire('pointerdown', 1, 150);
        fire('pointerdown', 2, 250);
        for (let step = 1; step <= 5; step++) fire('pointermove', 2, 250 + step * 20);
        fire('pointerup', 1, 150);
        fire('pointerup', 2, 350);
      });
      // The fingers went from 100 px apart to 200: twice the size.
      assert.equal(await onPhone.textContent('#zoom-level'), '200%');
    } finally {
      await small.close();
    }
  } finally {
    await handset.close();
    await desk.close();
    server.stop();
  }
});
