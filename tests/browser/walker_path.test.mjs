// A beach walker's path on a 390 px phone, step by step, each test failing on one of
// the trips walkers met: the record's time stuck at "now" after a photo taken hours
// earlier; a find on a walk placed where the form last opened; a record the server
// refused left stuck with field codes; a form that let a future date through; retries
// in the browser's words; a key that started with markings and let a basking shark lead
// for a 62 cm animal; reviewers' questions with no badge, states without explanation and
// Latin names; jargon; "About you" asking the name twice; cautions that named stingrays
// only and sat at the bottom of the page; no install button; a blank page while loading.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { copyFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { readFileSync } from 'node:fs';
import {
  startServer, launchBrowser, demoPhoto, openOnPhone, screenshotPath, reviewAction, sendNowAndWait, eventually,
} from './harness.mjs';

const HOME = { latitude: 52.4153, longitude: -4.0829, accuracy: 7 };
const RESPONDERS = '0800 000 0000 (invented demo stranding line)';
const checklist = JSON.parse(readFileSync(process.env.WRACKLINE_CHECKLIST, 'utf8'));

let browser;
let server;
before(async () => {
  browser = await launchBrowser();
  server = await startServer({ env: { WRACKLINE_RESPONDERS_PHONE: RESPONDERS } });
});
after(async () => {
  await browser?.close();
  server?.stop();
});

const scratch = mkdtempSync(path.join(tmpdir(), 'wrackline-walker-'));

// The demo catshark drawing with EXIF written by exiftool (CIPA DC-008 tags).
function photoWithExif(tags) {
  const file = path.join(scratch, `tagged-${Date.now()}-${Math.random().toString(16).slice(2)}.jpg`);
  copyFileSync(demoPhoto('catshark.jpg'), file);
  execFileSync('exiftool', ['-overwrite_original', '-all=', ...tags, file]);
  return file;
}

// Taken on the beach at 09:30 (+01:00) on 1 June 2025, 300 m north of HOME.
const BEACH_PHOTO_TAGS = ['-DateTimeOriginal=2025:06:01 09:30:00', '-OffsetTimeOriginal=+01:00',
  '-GPSLatitude=52.4180', '-GPSLatitudeRef=N', '-GPSLongitude=4.0829', '-GPSLongitudeRef=W', '-GPSHPositioningError=5'];

async function walkerPhone(options = {}) {
  return browser.newContext({
    viewport: { width: 390, height: 844 }, geolocation: HOME, permissions: ['geolocation'], timezoneId: 'Europe/London', ...options,
  });
}

async function fillFind(page, species = 'small-spotted catshark') {
  await page.fill('#species', species);
  await page.selectOption('#condition', 'fresh_dead');
  await page.selectOption('#setting', 'beach_stranding');
}

const waitReceived = (page, n = 1) => page.waitForFunction((count) => [...document.querySelectorAll('.outbox-entry')]
  .filter((li) => li.textContent.includes('received by the server')).length >= count, n, { timeout: 20000 });

const recordNamed = async (guess) => (await server.records()).find((r) => r.submission.species_guess === guess);

test('a photo taken earlier gives the record its own time and place; one tap keeps the phone\'s instead', async () => {
  const context = await walkerPhone();
  try {
    const page = await openOnPhone(context, server);
    await page.waitForFunction(() => /within/.test(document.querySelector('#position-note')?.textContent));
    const now = await page.inputValue('#when');
    await page.setInputFiles('#photo-input', photoWithExif(BEACH_PHOTO_TAGS));
    await page.waitForSelector('#photo-time-note', { timeout: 10000 });
    assert.equal(await page.inputValue('#when'), '2025-06-01T09:30', 'the photo\'s own time, not the phone\'s "now"');
    assert.equal(await page.inputValue('#latitude'), '52.418000', 'and the photo\'s place');
    assert.match(await page.textContent('#photo-time-note'), /Time and place taken from photo 1: it was taken 2025-06-01 09:30, .* before this phone's time/);
    await page.screenshot({ path: screenshotPath('walker-photo-time'), fullPage: true });
    await fillFind(page, 'photo-timed catshark');
    await page.click('#save-send');
    await waitReceived(page);
    const timed = await recordNamed('photo-timed catshark');
    assert.equal(Date.parse(timed.submission.observed_at), Date.parse('2025-06-01T09:30:00+01:00'));
    assert.equal(timed.submission.position.source, 'photo');

    // The same photo, but the walker keeps the phone's time and place with one tap.
    await page.setInputFiles('#photo-input', photoWithExif(BEACH_PHOTO_TAGS));
    await page.waitForSelector('#keep-device-time');
    await page.click('#keep-device-time');
    await page.waitForSelector('#photo-time-note', { state: 'detached' });
    assert.equal(await page.inputValue('#latitude'), HOME.latitude.toFixed(6));
    assert.ok((await page.inputValue('#when')) >= now, 'back to the phone\'s time');
    await fillFind(page, 'phone-timed catshark');
    await page.click('#save-send');
    await waitReceived(page, 2);
    const kept = await recordNamed('phone-timed catshark');
    assert.ok(Date.now() - Date.parse(kept.submission.observed_at) < 3600e3, kept.submission.observed_at);
    assert.equal(kept.submission.position.source, 'device');
  } finally {
    await context.close();
  }
});

test('on a survey walk a find takes a fresh position when it is saved, with its age and accuracy', async () => {
  const context = await walkerPhone();
  try {
    const page = await openOnPhone(context, server);
    await page.waitForFunction(() => /within/.test(document.querySelector('#position-note')?.textContent));
    await page.click('#walk-start summary');
    await page.click('#start-walk');
    await page.waitForSelector('#walk-active');
    // The walker goes on 290 m north along the strandline; the form was opened back there.
    const onward = { latitude: HOME.latitude + 290 / 111320, longitude: HOME.longitude, accuracy: 6 };
    await context.setGeolocation(onward);
    await page.waitForFunction(() => /\b2 points on the route so far|within 6 m/.test(document.querySelector('#walk-note')?.textContent
      + document.querySelector('#walk-progress')?.textContent));
    await fillFind(page, 'walk find');
    await page.click('#save-send');
    await waitReceived(page);
    const find = await recordNamed('walk find');
    assert.ok(Math.abs(find.submission.position.latitude - onward.latitude) < 1e-5,
      `the find is where the walker stood when saving: ${JSON.stringify(find.submission.position)}`);
    assert.equal(find.submission.position.accuracy_m, 6);
    assert.ok(find.submission.walk_client_id, 'on the walk');
    assert.match(await page.textContent('#saved-note'), /Position at saving: within 6 m, \d+ s old\./);
    await page.click('#end-walk');
  } finally {
    await context.close();
  }
});

test('the form checks the date as the server does, and says so beside the time', async () => {
  const context = await walkerPhone();
  try {
    const page = await openOnPhone(context, server);
    const tomorrow = await page.evaluate(() => {
      const d = new Date(Date.now() + 86400e3);
      const pad = (n) => String(n).padStart(2, '0');
      return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
    });
    await page.fill('#when', tomorrow);
    await fillFind(page);
    await page.click('#save-send');
    await page.waitForFunction(() => /in the future/.test(document.querySelector('.field-problem[data-control="when"]')?.textContent));
    assert.match(await page.textContent('#form-problems'), /^When: this is in the future/);
    assert.equal(await page.$$eval('.outbox-entry', (items) => items.length), 0, 'nothing saved');
    // The words sit right under the time: within a screen's height of it.
    const [when, words] = await Promise.all(['#when', '.field-problem[data-control="when"]'].map((s) => page.$eval(s, (el) => el.getBoundingClientRect().top + scrollY)));
    assert.ok(words - when < 120, `the problem is beside the control (${when} → ${words})`);
  } finally {
    await context.close();
  }
});

test('a record the server refuses can be edited and sent again, or discarded, in the form\'s own words', async () => {
  // A phone whose clock runs two days fast: the phone thinks the time is past, the
  // server's clock says it is in the future and refuses the record (422).
  const context = await walkerPhone();
  await context.clock.install({ time: new Date(Date.now() + 2 * 86400e3) });
  try {
    const page = await openOnPhone(context, server);
    const before = (await server.records()).length;
    for (const guess of ['fast-clock thornback', 'fast-clock spurdog']) {
      await fillFind(page, guess);
      await page.click('#save-send');
      await page.waitForFunction((g) => [...document.querySelectorAll('.outbox-entry')].some((li) => li.textContent.includes(g)
        && li.textContent.includes('not accepted by the server')), guess, { timeout: 20000 });
    }
    const refused = page.locator('.outbox-entry', { hasText: 'fast-clock thornback' });
    const said = await refused.textContent();
    assert.match(said, /not accepted by the server: When: the time .* is in the future/);
    assert.doesNotMatch(said, /observed_at|position\.|\b4\d\d\b/, 'no field codes, no bare status');
    await page.screenshot({ path: screenshotPath('walker-refused'), fullPage: true });

    await refused.locator('.edit-refused').click();
    await page.waitForFunction(() => /in the future/.test(document.querySelector('.field-problem[data-control="when"]')?.textContent));
    assert.equal(await page.inputValue('#species'), 'fast-clock thornback', 'the record is back in the form');
    await page.fill('#when', '2025-06-01T09:30');
    await page.click('#save-send');
    await page.waitForFunction(() => [...document.querySelectorAll('.outbox-entry')].some((li) => li.textContent.includes('fast-clock thornback')
      && li.textContent.includes('received by the server')), null, { timeout: 20000 });
    await page.locator('.outbox-entry', { hasText: 'fast-clock spurdog' }).locator('.discard-refused').click();
    await page.waitForFunction(() => ![...document.querySelectorAll('.outbox-entry')].some((li) => li.textContent.includes('fast-clock spurdog')));
    const after = await server.records();
    assert.equal(after.length, before + 1, 'one record put right and sent, the other discarded');
    assert.equal(Date.parse(after.find((r) => r.submission.species_guess === 'fast-clock thornback').submission.observed_at), Date.parse('2025-06-01T09:30:00+01:00'));
  } finally {
    await context.close();
  }
});

test('retries are said in plain words, not the browser\'s', async () => {
  const context = await walkerPhone();
  try {
    const page = await openOnPhone(context, server);
    await context.setOffline(true);
    await fillFind(page, 'offline catshark');
    await page.click('#save-send');
    await page.waitForFunction(() => /no connection to the server/.test(document.querySelector('#sync-status')?.textContent), null, { timeout: 15000 });
    const words = `${await page.textContent('#sync-status')} ${await page.textContent('#outbox-list')}`;
    assert.doesNotMatch(words, /Failed to fetch|answered \d{3}|ERR_/);
    await context.setOffline(false);
    await waitReceived(page);
  } finally {
    await context.close();
  }
});

test('the key asks the body shape first, keeps a giant from leading for a small animal, and names groups', async () => {
  const context = await walkerPhone();
  try {
    const page = await openOnPhone(context, server);
    await page.fill('#length', '62');
    await page.click('#open-key');
    await page.waitForSelector('.key-question');
    assert.equal(await page.$eval('.key-question', (q) => q.dataset.character), 'bodyForm', 'shark, ray or skate, chimaera first');
    // Answer as a crescent-tailed shark would (a basking shark fits the shape).
    const basking = checklist.taxa.find((t) => t.scientificName === 'Cetorhinus maximus');
    for (let step = 0; step < 4; step++) {
      const character = await page.$eval('.key-question', (q) => q.dataset.character);
      const state = basking.characters[character]?.[0];
      await page.click(state ? `.key-question .state-choice[data-state="${state}"]` : '.state-choice.not-sure');
      await page.waitForFunction((c) => document.querySelector('.key-question')?.dataset.character !== c, character);
    }
    const top = await page.$eval('.candidate', (li) => li.textContent);
    assert.doesNotMatch(top, /basking shark/, `a 62 cm animal: ${top}`);
    const listed = await page.$$eval('.candidate', (items) => items.map((li) => li.textContent).join('\n'));
    if (/basking shark/.test(listed)) assert.match(listed, /smaller than a newborn of this species/);
    const groups = await page.$$eval('.higher-rank', (buttons) => buttons.map((b) => ({ rank: b.dataset.rank, text: b.textContent })));
    assert.ok(groups.length > 0);
    assert.ok(!groups.some((g) => g.rank === 'superorder'), `no superorder on the observer's screen: ${JSON.stringify(groups)}`);
    assert.ok(groups.some((g) => / — family \w+idae/.test(g.text)), `families with their common names: ${JSON.stringify(groups)}`);
    for (const suggested of await page.$$eval('.higher-rank.suggested', (b) => b.map((x) => x.textContent))) {
      assert.match(suggested, /^Suggested: /, 'the suggestion is said in words');
    }
    await page.screenshot({ path: screenshotPath('walker-key'), fullPage: true });
  } finally {
    await context.close();
  }
});

test('a reviewer\'s question shows as a badge at the top; each state is explained, with the reason and the common name', async () => {
  const context = await walkerPhone();
  try {
    const page = await openOnPhone(context, server);
    for (const guess of ['asked ray', 'refused ray', 'named catshark']) {
      await fillFind(page, guess);
      await page.click('#save-send');
    }
    await waitReceived(page, 3);
    const id = async (guess) => (await recordNamed(guess)).submission.client_id;
    await reviewAction(server, await id('asked ray'), { action: 'request_details', message: 'Is there a spine on the tail?' });
    await reviewAction(server, await id('refused ray'), { action: 'not_confirmable', reason: 'the photo shows only the tail' });
    await reviewAction(server, await id('named catshark'), { action: 'confirm', scientific_name: 'Scyliorhinus stellaris', taxon_rank: 'species' });
    await sendNowAndWait(page);
    await page.waitForSelector('#questions-badge');
    assert.match(await page.textContent('#questions-badge'), /^1 A reviewer asked you something/);
    const [badge, form] = await Promise.all(['#questions-badge', '#record-form'].map((s) => page.$eval(s, (el) => el.getBoundingClientRect().top)));
    assert.ok(badge < form, 'the badge is above the form, where the eye is');
    const item = (guess) => page.locator('.my-record', { hasText: guess });
    assert.match(await item('asked ray').textContent(), /a reviewer asked you something/);
    assert.equal(await item('asked ray').locator('details.answer').getAttribute('open'), '', 'the answer box is open');
    const refused = await item('refused ray').textContent();
    assert.match(refused, /could not be confirmed.*Their reason: “the photo shows only the tail”/s);
    assert.match(await item('nursehound').textContent(), /nursehound \(Scyliorhinus stellaris\) · .* · confirmed/);
    await page.click('#questions-badge');
    await page.screenshot({ path: screenshotPath('walker-my-records'), fullPage: true });
    // Answered, the badge goes.
    await item('asked ray').locator('.answer-text').fill('Yes, near the base.');
    await item('asked ray').locator('.send-answer').click();
    await page.waitForSelector('#questions-badge', { state: 'detached', timeout: 15000 });
  } finally {
    await context.close();
  }
});

test('what is typed while the last find is being saved is kept, each find under its own name', async () => {
  const context = await walkerPhone();
  try {
    const page = await openOnPhone(context, server);
    await page.setInputFiles('#photo-input', demoPhoto('catshark.jpg'));
    await page.waitForSelector('.thumbs li.photo', { timeout: 20000 });
    await fillFind(page, 'first of two');
    // Tapped, then looked at one moment later (one turn of the page's event loop): the
    // save is under way, writing to the phone's storage, and the form takes no typing
    // that its clearing would wipe, nor a second tap.
    const lockedWhileSaving = await page.evaluate(async () => {
      document.querySelector('#save-send').click();
      await new Promise((resolve) => setTimeout(resolve, 0));
      return ['#species', '#photo-input', '#save-send'].map((s) => document.querySelector(s).matches(':disabled'));
    });
    assert.deepEqual(lockedWhileSaving, [true, true, true], 'the form is locked while the find is saved');
    // Typed at once, as a walker with a second animal at their feet would: it waits for
    // the form to be free, and is not wiped.
    await fillFind(page, 'second of two');
    assert.equal(await page.inputValue('#species'), 'second of two');
    await page.click('#save-send');
    await waitReceived(page, 2);
    const first = await recordNamed('first of two');
    const second = await recordNamed('second of two');
    assert.ok(first && second, 'both finds reached the server');
    assert.notEqual(first.submission.client_id, second.submission.client_id, 'each under its own record id');
    assert.equal(first.photos.length, 1, 'the first find kept its photo');
  } finally {
    await context.close();
  }
});

test('plain words on the form, the name asked once, and "About you" says what it kept', async () => {
  const context = await walkerPhone();
  try {
    const page = await openOnPhone(context, server);
    const text = await page.textContent('main');
    for (const jargon of ['± metres', 'its own offset', 'fixes kept', 'State and setting', 'How it was seen']) {
      assert.ok(!text.includes(jargon), `no "${jargon}" on the recording screen`);
    }
    assert.match(await page.textContent('#claspers-hint'), /Claspers: a male's two rod-like organs/);
    assert.equal(await page.$$eval('#record-form input', (inputs) => inputs.filter((i) => /name/i.test(i.closest('label')?.textContent ?? '')).length), 0,
      'the record form does not ask the name: About you does');
    await fillFind(page, 'about-you catshark');
    await page.click('#save-send');
    await page.waitForSelector('#about-you[open]', { timeout: 15000 });
    assert.equal(await page.$$eval('label', (labels) => labels.filter((l) => /Your name/.test(l.textContent)).length), 1, 'the name is asked once');
    await page.fill('#about-name', 'Invented Walker');
    await page.fill('#about-contact', 'walker@example.org');
    await page.click('#about-save');
    await page.waitForFunction(() => /^Saved: your records go as Invented Walker; reviewers can reach you/.test(document.querySelector('#about-note')?.textContent));
    assert.equal(await page.getAttribute('#about-you', 'open'), null, 'folded to one line');
    assert.match(await page.textContent('#about-summary'), /Invented Walker · contact given/);
  } finally {
    await context.close();
  }
});

test('cautions name dorsal spines, sit near the top, give the responders\' number, and are one tap away in the header', async () => {
  const context = await walkerPhone();
  try {
    const page = await context.newPage();
    await page.goto(server.url);
    await page.waitForSelector('#safety-ok');
    const first = await page.textContent('.safety-card');
    assert.match(first, /spurdogs \(spiny dogfish\) and chimaeras \(rabbitfish\)/, 'dorsal-spine cautions (common practice)');
    await page.waitForFunction((n) => document.querySelector('.responders')?.textContent.includes(n), RESPONDERS);
    await page.click('#safety-ok');
    const [reminders, form] = await Promise.all(['#safety-reminders', '#record-form'].map((s) => page.$eval(s, (el) => el.getBoundingClientRect().top)));
    assert.ok(reminders < form, 'the reminders come before the form, not at the bottom of the page');
    await page.click('#safety-link');
    await page.waitForSelector('#safety');
    assert.match(await page.textContent('#safety'), new RegExp(RESPONDERS.replace(/[()]/g, '\\$&')));
    await page.screenshot({ path: screenshotPath('walker-safety'), fullPage: true });
  } finally {
    await context.close();
  }
});

test('an install button appears when the browser offers installation, and asks the browser', async () => {
  const context = await walkerPhone();
  try {
    const page = await openOnPhone(context, server);
    assert.equal(await page.$('#install'), null, 'no button before the browser offers');
    // Chromium's own beforeinstallprompt needs an engagement score headless never gets;
    // the event is dispatched as the browser would, with its prompt() recorded.
    await page.evaluate(() => {
      const offer = new Event('beforeinstallprompt', { cancelable: true });
      offer.prompt = async () => { window.installPrompted = true; };
      offer.userChoice = Promise.resolve({ outcome: 'accepted' });
      window.dispatchEvent(offer);
    });
    await page.waitForSelector('#install');
    await page.click('#install');
    await page.waitForFunction(() => window.installPrompted === true);
    await page.waitForSelector('#install', { state: 'detached' });
  } finally {
    await context.close();
  }
});

test('the first load says it is loading, and says so plainly when the app cannot start', async () => {
  const context = await walkerPhone({ serviceWorkers: 'block' });
  try {
    const page = await context.newPage();
    // The wasm never arrives: the page's own words must say what is happening.
    await page.route('**/*.wasm', (route) => route.abort());
    await page.goto(server.url);
    assert.match(await page.textContent('#loading'), /wrackline/);
    await page.waitForFunction(() => /could not start/.test(document.querySelector('#loading-words')?.textContent), null, { timeout: 15000 });
    await page.unroute('**/*.wasm');
    await page.reload();
    await page.waitForSelector('#safety-ok');
    assert.equal(await page.$('#loading'), null, 'the loading message goes once the app is up');
    await eventually('the page has no inline script (CSP script-src \'self\')',
      async () => (await page.$$eval('script', (scripts) => scripts.every((s) => s.src))));
  } finally {
    await context.close();
  }
});
