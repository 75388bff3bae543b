// The desk's screens for the people who go out, on a 390 px phone against the real
// server: a responder signs in, sees the live animal awaiting a response on top (with the
// cautions first, its place as a map link, what the finder wrote and how the responders
// were told), logs a response and it leaves the top; a reviewer adds two samples and a
// carcass report to a record, changes one sample, and finds the animal again by a sample's
// id. And the split: the phone's bundle carries none of the desk's screens, the phone's
// page fetches nothing from /desk/, its service worker keeps nothing of it, and the desk
// opens even where that worker controls the site.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import http from 'node:http';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import {
  startServer, launchBrowser, phone, openOnPhone, eventually, screenshotPath, sendRecord, plainRecord,
  RESPONDER, REVIEWER,
} from './harness.mjs';

const SCREEN = { width: 390, height: 844 };
const HOME = { latitude: 52.4153, longitude: -4.0829, accuracy: 7 };

let browser;
let server;
let receiver;

before(async () => {
  browser = await launchBrowser();
  // The responders' webhook: a small receiver on 127.0.0.1 that acknowledges every alert.
  receiver = http.createServer((request, response) => {
    request.resume();
    request.on('end', () => response.writeHead(204).end());
  });
  await new Promise((resolve) => receiver.listen(0, '127.0.0.1', resolve));
  server = await startServer({
    env: {
      WRACKLINE_RESPONDERS_WEBHOOK: `http://127.0.0.1:${receiver.address().port}/alerts`,
      WRACKLINE_RESPONDERS_WEBHOOK_SECRET: 'browser-test-secret',
    },
  });
});
after(async () => {
  await browser?.close();
  server?.stop();
  receiver?.close();
});

function liveRecord(clientId, notes, hoursAgo) {
  return { ...plainRecord(clientId, 'angelshark', { hoursAgo }), condition: 'alive', notes };
}

async function signIn(page, person, hash) {
  await page.goto(`${server.url}/desk/${hash}`);
  await page.fill('#username', person.username);
  await page.fill('#password', person.password);
  await page.click('#sign-in button[type=submit]');
}

// No sideways scrolling on the phone (the layout rule every screen keeps).
async function fitsThePhone(page, name) {
  const widths = await page.evaluate(() => ({ scroll: document.documentElement.scrollWidth, inner: innerWidth }));
  assert.ok(widths.scroll <= widths.inner, `${name}: ${widths.scroll} px wide on a ${widths.inner} px screen`);
  await page.screenshot({ path: screenshotPath(name), fullPage: true });
}

const topItem = (page) => page.getAttribute('#urgent-list > li:first-child', 'data-client-id');

test('a responder sees the live animal awaiting a response on top, logs a response, and it leaves the top', async () => {
  const older = 'f1000000-0000-4000-8000-000000000001';
  const newer = 'f1000000-0000-4000-8000-000000000002';
  await sendRecord(server, liveRecord(older, 'moving its tail at the tide line', 5));
  await sendRecord(server, liveRecord(newer, 'on its side by the groyne, gills moving', 2));
  const context = await browser.newContext({ viewport: SCREEN });
  try {
    const page = await context.newPage();
    await signIn(page, RESPONDER, '');
    // A responder lands on the live animals, whatever the address asked for.
    await page.waitForSelector('#urgent-list > li');
    assert.equal(await topItem(page), newer, 'the newest animal awaiting a response is on top');
    const top = '#urgent-list > li:first-child';
    assert.match(await page.getAttribute(top, 'class'), /awaiting/);
    assert.match(await page.textContent(`${top} .urgent-wrote`), /on its side by the groyne, gills moving/);
    // geo URI (RFC 5870): the coordinates as sent.
    assert.equal(await page.getAttribute(`${top} a.map-link[href^="geo:"]`, 'href'), 'geo:52.415300,-4.082900');
    assert.equal(await page.$(`${top} .urgent-finder`), null, 'a responder is not shown the finder\'s contact');
    // The cautions come before any live animal.
    const cautionsFirst = await page.evaluate(() => {
      const cautions = document.querySelector('#urgent-cautions');
      const list = document.querySelector('#urgent-list');
      return Boolean(cautions.compareDocumentPosition(list) & Node.DOCUMENT_POSITION_FOLLOWING);
    });
    assert.ok(cautionsFirst, 'the cautions are above the list');
    assert.match(await page.textContent('#urgent-cautions'), /Keep back/);
    assert.match(await page.textContent('#urgent-cautions'), /Do not drag or push it back to sea unless you are trained/);
    // The webhook acknowledged the alert: the delivery state says so (refreshed until it does).
    await eventually('the webhook delivery shown', async () => {
      await page.click('#urgent-reload');
      return /webhook: delivered/.test(await page.textContent(`${top} .notifications`).catch(() => ''));
    });
    await fitsThePhone(page, 'desk-urgent-list');

    await page.click(`${top} .response-toggle`);
    await page.waitForSelector('#response-form');
    await page.selectOption('#response-outcome', 'returned_to_sea');
    await page.click('#response-save');
    // Nobody named: refused beside "Who went", nothing sent.
    await page.waitForSelector('#response-form .field-problem[data-field="who_went"]');
    assert.equal(await topItem(page), newer);
    await page.fill('#response-who', 'Nia and Tom (invented responders)');
    await page.fill('#response-notes', 'refloated at high water, swam off');
    await fitsThePhone(page, 'desk-urgent-response-form');
    await page.click('#response-save');
    await page.waitForFunction((id) => document.querySelector('#urgent-list > li:first-child')?.dataset.clientId !== id, newer);
    assert.equal(await topItem(page), older, 'the animal still awaiting a response is on top now');
    const answered = `#urgent-list > li[data-client-id="${newer}"]`;
    assert.doesNotMatch(await page.getAttribute(answered, 'class'), /awaiting/);
    assert.match(await page.textContent(`${answered} .response-log`), /returned to sea: Nia and Tom \(invented responders\) went/);
    assert.match(await page.textContent(`${answered} .response-log`), /logged by/);
    // A responder has no review queue and no samples.
    assert.equal(await page.$('#samples-link'), null);
  } finally {
    await context.close();
  }
});

async function addSample(page, sample) {
  await page.selectOption('#sample-kind', sample.kind);
  await page.fill('#sample-code', sample.code);
  await page.selectOption('#sample-preservation', sample.preservation);
  await page.fill('#sample-stored', sample.stored);
  await page.fill('#sample-held', sample.held);
  await page.click('#sample-save');
}

test('a reviewer adds two samples and a carcass report, changes a sample, and finds the animal by a sample id', async () => {
  const clientId = 'f2000000-0000-4000-8000-000000000001';
  await sendRecord(server, { ...plainRecord(clientId, 'tope', { hoursAgo: 30 }), notes: 'fresh, on the strandline' });
  const context = await browser.newContext({ viewport: SCREEN });
  try {
    const page = await context.newPage();
    await signIn(page, REVIEWER, '#review');
    await page.click(`.queue-item[data-client-id="${clientId}"] button.link`);
    await page.waitForSelector('#sample-form');

    // A code the label printer would never make: refused beside the code, before sending.
    await addSample(page, { kind: 'vertebrae', code: 'WRK V 2', preservation: 'frozen', stored: 'Freezer 2', held: 'Invented Marine Lab' });
    assert.match(await page.textContent('#sample-form .field-problem[data-field="code"]'), /may hold letters, digits/);
    assert.equal(await page.$$eval('#samples-list li', (items) => items.length), 0);

    await page.fill('#sample-code', 'WRK-T-001');
    await page.selectOption('#sample-kind', 'tissue_for_genetics');
    await page.selectOption('#sample-preservation', 'ethanol');
    await page.click('#sample-save');
    await page.waitForSelector('#samples-list li[data-code="WRK-T-001"]');
    await addSample(page, { kind: 'vertebrae', code: 'WRK-V-002', preservation: 'frozen', stored: 'Freezer 2', held: 'Invented Marine Lab' });
    await page.waitForSelector('#samples-list li[data-code="WRK-V-002"]');
    // The same id again: the server refuses it, and the words are shown under the form.
    await addSample(page, { kind: 'other', code: 'WRK-V-002', preservation: 'dried', stored: 'Shelf 1', held: 'Invented Marine Lab' });
    await page.waitForFunction(() => /already has the id WRK-V-002/.test(document.querySelector('#sample-form')?.textContent));
    assert.equal(await page.$$eval('#samples-list li', (items) => items.length), 2, 'nothing stored twice');

    // The carcass: fate and necropsy findings, examined yesterday.
    const yesterday = new Date(Date.now() - 24 * 3600e3);
    const local = new Date(yesterday.getTime() - yesterday.getTimezoneOffset() * 60e3).toISOString().slice(0, 16);
    await page.selectOption('#carcass-fate', 'taken_for_study');
    await page.fill('#carcass-examined', local);
    await page.selectOption('#carcass-condition', 'poor');
    await page.selectOption('#carcass-stomach', 'some_food');
    await page.fill('#carcass-injuries', 'hook in the jaw, line trailing');
    await page.click('#carcass-save');
    await page.waitForSelector('#carcass-shown');
    const carcass = await page.textContent('#carcass-shown');
    for (const words of [/fate: taken for study/, /body condition: poor/, /stomach: some food/, /injuries: hook in the jaw/, /recorded by/]) {
      assert.match(carcass, words);
    }

    // Change where one sample is kept.
    await page.click('#samples-list li[data-code="WRK-V-002"] .sample-change');
    assert.equal(await page.inputValue('#sample-code'), 'WRK-V-002');
    await page.fill('#sample-stored', 'Freezer 3, rack C');
    await page.click('#sample-save');
    await page.waitForFunction(() => /Freezer 3, rack C.*changed/.test(document.querySelector('#samples-list li[data-code="WRK-V-002"]')?.textContent));
    await fitsThePhone(page, 'desk-record-samples-carcass');

    // Back to the animal from a sample's id, as a scanner types it (the code, then Enter).
    await page.click('#samples-link');
    await page.fill('#lookup-code', 'nobody-has-this');
    await page.press('#lookup-code', 'Enter');
    await page.waitForFunction(() => /no sample with the id nobody-has-this/.test(document.querySelector('#lookup-problem')?.textContent));
    await page.fill('#lookup-code', 'WRK-V-002');
    await page.press('#lookup-code', 'Enter');
    await page.waitForSelector('#lookup-result');
    assert.equal(await page.getAttribute('#lookup-result', 'data-record'), clientId);
    const samples = await page.textContent('#lookup-samples');
    assert.match(samples, /WRK-T-001 · tissue for genetics · in ethanol · stored at Freezer 2/);
    assert.match(samples, /WRK-V-002 · vertebrae · frozen · stored at Freezer 3, rack C/);
    assert.match(await page.textContent('#lookup-animal'), /tope/);
    assert.ok(await page.$$eval('#lookup-trail li', (items) => items.length) >= 3, 'the trail lists the changes');
    await fitsThePhone(page, 'desk-sample-lookup');
  } finally {
    await context.close();
  }
});

test('the phone\'s bundle carries none of the desk\'s screens, and the phone fetches and keeps nothing of the desk', async () => {
  const dist = process.env.WRACKLINE_APP_DIR;
  const phoneWasm = readFileSync(path.join(dist, 'wrackline_app_bg.wasm')).toString('latin1');
  const deskWasm = readFileSync(path.join(dist, 'desk', 'wrackline_desk_bg.wasm')).toString('latin1');
  // Words only the desk's screens say (review, live animals, samples, carcass, people, figures).
  const deskWords = ['Find an animal by a sample', 'Carcass and necropsy', 'Log the response',
    'Decisions are kept with who made them', 'Ask the observer', 'Range of ', 'Add a sample'];
  for (const words of deskWords) {
    assert.ok(deskWasm.includes(words), `the desk's bundle says "${words}"`);
    assert.ok(!phoneWasm.includes(words), `the phone's bundle does not say "${words}"`);
  }
  assert.ok(phoneWasm.includes('Before your first record') && !deskWasm.includes('Before your first record'),
    'the recording screens are the phone\'s alone');

  const context = await phone(browser, HOME);
  try {
    const fetched = [];
    context.on('request', (request) => fetched.push(new URL(request.url()).pathname));
    const page = await openOnPhone(context, server);
    await page.waitForSelector('#record-form');
    await page.waitForLoadState('networkidle');
    assert.deepEqual(fetched.filter((p) => p.startsWith('/desk')), [], 'the phone\'s page fetched nothing of the desk');
    const kept = await page.evaluate(async () => {
      const names = [];
      for (const key of await caches.keys()) {
        for (const request of await (await caches.open(key)).keys()) names.push(new URL(request.url).pathname);
      }
      return names;
    });
    assert.ok(kept.includes('/wrackline_app_bg.wasm'), `the worker keeps the phone's app: ${kept.join(', ')}`);
    assert.deepEqual(kept.filter((p) => p.startsWith('/desk')), [], 'the worker keeps nothing of the desk');
    // The header's links are plain links to the desk, and the desk opens though the
    // phone's worker controls the site (it never answers with the phone's page).
    assert.equal(await page.getAttribute('.top-links a[href$="#review"]', 'href'), '/desk/#review');
    await page.click('.top-links a[href$="#review"]');
    await page.waitForSelector('#sign-in');
    assert.equal(await page.title(), 'wrackline · desk');
  } finally {
    await context.close();
  }
});
