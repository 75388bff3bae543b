// The app in its second language (Welsh, `cy`), as a phone set to Welsh opens it: the
// language comes from the browser's languages, the walker's path (cautions, a record
// saved offline, sent when the connection returns, My records) shows the catalogue's
// Welsh words with dates formatted for Welsh, the switch on the page changes the language
// and keeps the choice on the device, the guided key asks the checklist's Welsh questions
// and a photo's time note is Welsh, and the desk's page, sign-in, safety screen and figures
// (labels, units, the trend's lines, the caveat, download captions) speak Welsh too. Each
// assertion fails if a screen falls back to English.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { startServer, launchBrowser, REVIEWER, eventually, demoPhoto, screenshotPath, sendRecord as sendAsPhone, plainRecord } from './harness.mjs';

const checklist = JSON.parse(readFileSync(process.env.WRACKLINE_CHECKLIST, 'utf8'));
const welshKey = checklist.translations.cy.characters;

const HOME = { latitude: 52.4153, longitude: -4.0829, accuracy: 7 };

let browser;
let server;
before(async () => {
  browser = await launchBrowser();
  server = await startServer({ env: { WRACKLINE_RESPONDERS_PHONE: '0800 000 0000 (invented demo stranding line)' } });
});
after(async () => {
  await browser?.close();
  server?.stop();
});

// A phone whose browser is set to Welsh (Playwright's `locale` sets navigator.languages
// and Accept-Language).
function welshPhone() {
  return browser.newContext({
    viewport: { width: 390, height: 844 }, geolocation: HOME, permissions: ['geolocation'],
    timezoneId: 'Europe/London', locale: 'cy-GB',
  });
}

const text = (page, selector) => page.textContent(selector);

test('a walker whose phone is set to Welsh records offline, syncs and reads My records in Welsh', async () => {
  const context = await welshPhone();
  try {
    const page = await context.newPage();
    await page.goto(server.url);
    await page.waitForSelector('#safety-ok', { timeout: 15000 });
    assert.equal(await page.getAttribute('html', 'lang'), 'cy');
    // The cautions before the first record, in Welsh, never left in English.
    const cautions = await text(page, '.safety-card');
    assert.match(cautions, /Cyn eich cofnod cyntaf/);
    assert.match(cautions, /Wylwyr y Glannau/);
    assert.match(cautions, /0800 000 0000/);
    assert.doesNotMatch(cautions, /Keep back|venomous|coastguard/);
    assert.equal(await text(page, '#safety-ok'), 'Rwyf wedi darllen hwn');
    await page.click('#safety-ok');
    await page.waitForFunction(() => navigator.serviceWorker?.controller, null, { timeout: 15000 });

    assert.equal(await text(page, '#record-form h2'), 'Cofnod newydd');
    await context.setOffline(true);
    await page.waitForFunction(() => document.querySelector('#connection')?.textContent.startsWith('all-lein'));
    await page.fill('#species', 'morgi mannog bach');
    await page.selectOption('#condition', 'fresh_dead');
    await page.selectOption('#setting', 'beach_stranding');
    // The choices of the form's menus are Welsh too.
    assert.equal(await page.$eval('#condition option[value="fresh_dead"]', (o) => o.textContent), 'newydd farw');
    await page.click('#save-send');
    await page.waitForFunction(() => /Wedi'i gadw ar y ffôn hwn/.test(document.querySelector('#saved-note')?.textContent));
    await page.waitForFunction(() => document.querySelector('.outbox-entry .state')?.textContent === 'yn aros i anfon');
    assert.match(await text(page, '.outbox-entry .summary'), /1 llun|dim lluniau/);
    assert.equal((await server.records()).length, 0, 'nothing reaches the server while offline');

    await context.setOffline(false);
    await page.click('#send-now');
    await page.waitForFunction(() => document.querySelector('.outbox-entry .state')?.textContent === "wedi'i dderbyn gan y gweinydd",
      null, { timeout: 15000 });
    await eventually('the record on the server', async () => (await server.records()).length === 1);

    assert.equal(await text(page, '#my-records-heading'), 'Fy nghofnodion');
    await page.waitForSelector('#my-records .my-record', { timeout: 15000 });
    assert.equal(await text(page, '.my-record .review-state'), 'yn aros am adolygydd');
    // The day as the browser's Intl writes it for Welsh (Debian's Chromium has no Welsh
    // month names and writes "2026 M12 5"; Node's ICU writes "5 Rhag 2026"), not the ISO form.
    const today = await page.evaluate(() => new Intl.DateTimeFormat('cy', { dateStyle: 'medium' }).format(new Date()));
    assert.doesNotMatch(await text(page, '.my-record'), /\d{4}-\d{2}-\d{2}/);
    assert.match(await text(page, '.my-record'), new RegExp(today.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')));
  } finally {
    await context.close();
  }
});

const scratch = mkdtempSync(path.join(tmpdir(), 'wrackline-welsh-'));

// The demo catshark drawing with EXIF written by exiftool (CIPA DC-008 tags): taken at
// 09:30 (+01:00) on 1 June 2025, 300 m north of HOME.
function beachPhoto() {
  const file = path.join(scratch, `beach-${Date.now()}.jpg`);
  copyFileSync(demoPhoto('catshark.jpg'), file);
  execFileSync('exiftool', ['-overwrite_original', '-all=', '-DateTimeOriginal=2025:06:01 09:30:00',
    '-OffsetTimeOriginal=+01:00', '-GPSLatitude=52.4180', '-GPSLatitudeRef=N', '-GPSLongitude=4.0829',
    '-GPSLongitudeRef=W', '-GPSHPositioningError=5', file]);
  return file;
}

test("a photo's time note, what the photo and the phone say, and the guided key are in Welsh", async () => {
  const context = await welshPhone();
  try {
    const page = await context.newPage();
    await page.goto(server.url);
    await page.click('#safety-ok', { timeout: 15000 });
    await page.setInputFiles('#photo-input', beachPhoto());
    await page.waitForSelector('#photo-time-note', { timeout: 10000 });
    // Welsh puts the singular after a number ("3 diwrnod"); the English would say "days".
    const note = await text(page, '#photo-time-note');
    assert.match(note, /^Daw'r amser a'r lle o lun 1: cafodd ei dynnu 2025-06-01 09:30, \d+ diwrnod cyn amser y ffôn hwn\./);
    assert.doesNotMatch(note, /taken from photo|days|before this phone/);
    const says = await text(page, '.photo-says');
    assert.match(says, /^mae'r llun yn dweud: 2025-06-01 09:30:00 \(UTC\+01:00, cylchfa amser y camera ei hun\) · .* o fewn 5 m$/);
    assert.match(await text(page, '#device-says'), /^mae'r ffôn hwn yn dweud: /);

    // The key's first question and its answers as the checklist gives them in Welsh.
    await page.click('#open-key');
    await page.waitForSelector('.key-question');
    assert.equal(await page.$eval('.key-question', (q) => q.dataset.character), 'bodyForm');
    assert.equal(await text(page, '.key-question .question'), "Pa siâp yw'r corff?");
    assert.equal(await text(page, '.key-question .question'), welshKey.bodyForm.question);
    assert.equal(await text(page, '.state-choice[data-state="sharkLike"] span:last-child'), welshKey.bodyForm.states.sharkLike);
    await page.screenshot({ path: screenshotPath('welsh-key'), fullPage: true });
    await page.click('.key-question .state-choice[data-state="sharkLike"]');
    await page.waitForFunction(() => document.querySelector('.key-question')?.dataset.character !== 'bodyForm');
    const next = await page.$eval('.key-question', (q) => q.dataset.character);
    assert.equal(await text(page, '.key-question .question'), welshKey[next].question);
    // A group to stop at names its rank in Welsh; the species' names stay as the checklist gives them.
    assert.match(await text(page, '.higher-rank[data-rank="family"]'), / teulu [A-Z][a-z]+idae/);
    assert.doesNotMatch(await text(page, '.key-panel'), /What shape|family [A-Z]/);
    // Stopping there: the record's note names the rank in Welsh too.
    await page.click('.higher-rank[data-rank="family"]');
    await page.waitForSelector('#key-choice');
    assert.match(await text(page, '#key-choice'), /\(teulu, /);
  } finally {
    await context.close();
  }
});

test('the switch on the page changes the language and the phone keeps the choice', async () => {
  const context = await welshPhone();
  try {
    const page = await context.newPage();
    await page.goto(server.url);
    await page.waitForSelector('#safety-ok', { timeout: 15000 });
    assert.equal(await text(page, '#safety-link'), 'Diogelwch');
    await Promise.all([page.waitForEvent('load'), page.selectOption('#language', 'en')]);
    await page.waitForSelector('#safety-ok', { timeout: 15000 });
    assert.equal(await text(page, '#safety-link'), 'Safety');
    assert.equal(await page.getAttribute('html', 'lang'), 'en');
    // Kept on the device: a new visit on the Welsh-speaking browser stays in English.
    await page.reload();
    await page.waitForSelector('#safety-ok', { timeout: 15000 });
    assert.equal(await text(page, '#safety-ok'), 'I have read this');
  } finally {
    await context.close();
  }
});

test("the desk's page, sign-in, queue and safety screen speak Welsh", async () => {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, locale: 'cy-GB' });
  try {
    const page = await context.newPage();
    await page.goto(`${server.url}/desk/`);
    await page.waitForSelector('#sign-in', { timeout: 15000 });
    assert.equal(await text(page, '#urgent-link'), 'Anifeiliaid byw');
    assert.equal(await text(page, '#phone-link'), 'Cofnodi canfyddiad');
    assert.match(await text(page, 'main'), /Mewngofnodi/);
    assert.match(await text(page, 'main'), /Cyfrinair/);
    await page.fill('#username', REVIEWER.username);
    await page.fill('#password', REVIEWER.password);
    await page.click('#sign-in button[type=submit]');
    await page.waitForSelector('#sign-in', { state: 'detached', timeout: 15000 });
    // Why a record is first in the queue, worded by the desk from what the server says.
    await sendAsPhone(server, { ...plainRecord('5a1e0c3d-9b7f-4e21-8c6d-0f2e4a6b8c10', 'angelshark'), condition: 'alive' });
    await page.goto(`${server.url}/desk/#review`);
    await page.waitForSelector('.queue-item', { timeout: 15000 });
    const queue = await text(page, '#queue');
    assert.match(queue, /anifail byw: dim ymateb wedi'i gofnodi eto/);
    assert.match(queue, /Squatina squatina wedi'i warchod/);
    assert.doesNotMatch(queue, /no response logged|is protected|is sensitive/);
    await page.goto(`${server.url}/desk/#safety`);
    await page.waitForSelector('#safety', { timeout: 15000 });
    const safety = await text(page, '#safety');
    assert.match(safety, /Diogelwch ar y traeth/);
    assert.match(safety, /Mae'r pigau'n wenwynig/);
    assert.doesNotMatch(safety, /venomous/);
  } finally {
    await context.close();
  }
});

// A record as a phone sends it, straight to the API (the figures need a few years of them).
async function sendRecord(id, year, latitude, longitude) {
  const record = {
    client_id: id, observed_at: `${year}-06-01T09:00:00+01:00`,
    position: { latitude, longitude, accuracy_m: 10, source: 'device' },
    species_guess: 'small-spotted catshark', length: null, sex: 'unknown', count: 1,
    condition: 'fresh_dead', setting: 'beach_stranding', human_signs: [], notes: null, observer_name: null,
  };
  const form = new FormData();
  form.append('record', JSON.stringify(record));
  const response = await fetch(`${server.url}/api/observations`, { method: 'POST', body: form });
  assert.equal(response.status, 200, await response.text());
}

test("the desk's figures, their caveat and the download captions speak Welsh", async () => {
  await sendRecord('c7000000-0000-4000-8000-000000000001', 2022, 52.41, -4.09);
  await sendRecord('c7000000-0000-4000-8000-000000000002', 2023, 52.24, -4.26);
  await sendRecord('c7000000-0000-4000-8000-000000000003', 2024, 52.13, -4.55);
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, locale: 'cy-GB' });
  try {
    const page = await context.newPage();
    await page.goto(`${server.url}/desk/#figures`);
    await page.waitForSelector('#figures-show', { timeout: 15000 });
    await page.fill('#figures-taxon', 'Scyliorhinus canicula');
    await page.selectOption('#figures-state', 'any');
    await page.click('#figures-show');
    await page.waitForSelector('#range-table', { timeout: 15000 });
    await page.waitForSelector('#trend-figures', { timeout: 15000 });

    // The caveat said once at the top, and the captions under the choices, in Welsh.
    const caveat = await text(page, '#figures-caveat');
    assert.match(caveat, /nid penderfyniad rhestru/);
    assert.doesNotMatch(caveat, /listing decision/);
    assert.match(await text(page, '#figures-state-words'), /Yn cyfrif pob cofnod sydd wedi'i gadw/);
    assert.match(await text(page, '#export-state-words'), /Yn cyfrif cofnodion wedi'u cadarnhau yn unig/);

    // The range table's labels and units, built in data/, in Welsh.
    const labels = await page.$$eval('#range-table tbody th', (ths) => ths.map((th) => th.textContent));
    assert.deepEqual(labels, ['Cofnodion', 'Safleoedd gwahanol', 'EOO', 'AOO', "AOO lleiaf (gridiau wedi'u symud)"]);
    const cells = await page.$$eval('#range-table tbody td', (tds) => tds.map((td) => td.textContent));
    assert.ok(cells.some((c) => /^[\d.,]+ km²$/.test(c)), `areas with their unit: ${cells}`);

    // The trend's lines: Welsh labels, and the window too long for three years said in Welsh.
    const trend = await page.$$eval('#trend-figures .figure-line', (lines) =>
      Object.fromEntries(lines.map((l) => [l.querySelector('dt').textContent, l.querySelector('dd').textContent])));
    assert.match(trend['Cyfradd newid y flwyddyn'], /cyfwng 95%/);
    assert.match(trend['Newid dros y ffenestr asesu'], /^heb ei roi: /);
    assert.match(trend['Gwasgariad a model'], /^Gwasgariad Pearson /);
    assert.doesNotMatch(Object.keys(trend).join(' | '), /Rate of change|Years fitted|Dispersion/);
    // (The generation length's source is the checklist's own text, shown as it is.)
    const ours = Object.entries(trend).filter(([label]) => label !== 'Sut y dewiswyd y ffenestr').map(([, v]) => v);
    assert.doesNotMatch(ours.join(' | '), /interval|not given|per year|degrees of freedom/);
  } finally {
    await context.close();
  }
});
