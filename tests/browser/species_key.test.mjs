// The guided key in the phone, offline: questions with pictures, "not sure" changing
// nothing, candidates narrowing as the observer answers a stingray's features, one tap
// to pick, and the pick with its answers reaching the server with the record; the
// hint for species the questions cannot tell apart; stopping at a family, sent and
// exported at that rank; confirmed records nearby raising a species, kept for offline use.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { startServer, launchBrowser, screenshotPath, demoPhoto, phone, openOnPhone, REVIEWER } from './harness.mjs';

const checklist = JSON.parse(readFileSync(process.env.WRACKLINE_CHECKLIST, 'utf8'));
const taxon = (name) => checklist.taxa.find((t) => t.scientificName === name);
const stingray = taxon('Dasyatis pastinaca');
const HOME = { latitude: 52.4153, longitude: -4.0829, accuracy: 12 };

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

async function topCandidate(page) {
  return page.$eval('.candidate', (li) => li.textContent);
}

// Answers the questions as `animal` shows itself ("not sure" where its entry says
// nothing) until `done(answered)` says stop or the key has nothing more to ask.
// Returns the characters answered, in order.
async function answerAs(page, animal, done) {
  const answered = [];
  for (let step = 0; step < 20; step++) {
    const character = await page.$eval('.key-question', (q) => q.dataset.character).catch(() => null);
    if (!character) break;
    const state = animal.characters[character]?.[0];
    if (state) await page.click(`.key-question .state-choice[data-state="${state}"]`);
    else await page.click('.state-choice.not-sure');
    answered.push(character);
    await page.waitForFunction((c) => document.querySelector('.key-question')?.dataset.character !== c, character);
    if (await done(answered)) break;
  }
  return answered;
}

// A record sent straight to the server and confirmed by the reviewer.
async function confirmedRecord(server, id, guess, name, { latitude, longitude }) {
  const record = {
    client_id: id, observed_at: '2025-05-01T09:00:00+01:00',
    position: { latitude, longitude, accuracy_m: 10, source: 'device' },
    species_guess: guess, length: null, sex: 'unknown', count: 1,
    condition: 'fresh_dead', setting: 'beach_stranding', human_signs: [], notes: null, observer_name: null,
  };
  const form = new FormData();
  form.append('record', JSON.stringify(record));
  const sent = await fetch(`${server.url}/api/observations`, { method: 'POST', body: form });
  assert.equal(sent.status, 200, await sent.text());
  const login = await fetch(`${server.url}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(REVIEWER) });
  const { csrf_token: csrf } = await login.json();
  const cookie = login.headers.get('set-cookie').split(';')[0];
  const acted = await fetch(`${server.url}/api/review/records/${id}/actions`, {
    method: 'POST', headers: { 'content-type': 'application/json', cookie, 'x-csrf-token': csrf },
    body: JSON.stringify({ action: 'confirm', scientific_name: name, taxon_rank: 'species' }),
  });
  assert.equal(acted.status, 200, await acted.text());
}

test('the key works offline, narrows to the animal and sends the pick with the record', async () => {
  const server = await startServer();
  const context = await phone(browser, { latitude: 52.4153, longitude: -4.0829, accuracy: 12 });
  try {
    const page = await openOnPhone(context, server);
    await context.setOffline(true);
    await page.reload();
    await page.waitForSelector('#open-key');
    await page.fill('#length', '42');
    await page.selectOption('#length-kind', 'disc_width');
    await page.click('#open-key');
    await page.waitForSelector('.key-question');

    // Pictures drawn for the project accompany the answers.
    assert.ok(await page.$$eval('.state-choice svg', (svgs) => svgs.length) >= 3);

    // "Not sure" changes no candidate's standing.
    const before = await page.$$eval('.candidate', (items) => items.map((li) => li.textContent));
    const firstCharacter = await page.$eval('.key-question', (q) => q.dataset.character);
    await page.click('.state-choice.not-sure');
    await page.waitForFunction((c) => document.querySelector('.key-question')?.dataset.character !== c, firstCharacter);
    assert.deepEqual(await page.$$eval('.candidate', (items) => items.map((li) => li.textContent)), before);

    // Answer as the animal shows itself, until the key is sure (and has asked about the
    // tail spine, which this test checks is sent) or has nothing to ask.
    const answered = await answerAs(page, stingray, async (said) =>
      said.includes('tailSpine') && /(\d+)%/.exec(await topCandidate(page))?.[1] >= 90);
    assert.ok(answered.includes('tailSpine'), `the tail-spine question was asked: ${answered}`);
    const top = await topCandidate(page);
    assert.match(top, /common stingray \(Dasyatis pastinaca\)/);
    await page.screenshot({ path: screenshotPath('key'), fullPage: true });
    await page.click('.candidate .pick');
    await page.waitForSelector('#key-choice');
    assert.match(await page.textContent('#key-choice'), /Dasyatis pastinaca \(species/);
    assert.equal(await page.inputValue('#species'), 'common stingray (Dasyatis pastinaca)');

    await page.selectOption('#condition', 'fresh_dead');
    await page.selectOption('#setting', 'beach_stranding');
    await page.setInputFiles('#photo-input', demoPhoto('stingray.jpg'));
    await page.click('#save-send');
    await page.waitForSelector('.outbox-entry');
    await context.setOffline(false);
    await page.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 30000 });

    const [record] = await server.records();
    const choice = record.submission.key_choice;
    assert.equal(choice.scientific_name, 'Dasyatis pastinaca');
    assert.equal(choice.taxon_rank, 'species');
    assert.equal(choice.answers[firstCharacter], 'notSure');
    assert.equal(choice.answers.tailSpine, 'present');
    assert.deepEqual(record.flags, [], 'a 42 cm stingray in Cardigan Bay raises no flag');
  } finally {
    await context.close();
    server.stop();
  }
});

test('the key says which species its questions cannot tell apart', async () => {
  const server = await startServer();
  const context = await phone(browser, HOME);
  try {
    const page = await openOnPhone(context, server);
    await page.click('#open-key');
    await page.waitForSelector('.key-question');
    await answerAs(page, taxon('Raja brachyura'), async () => false);
    assert.match(await topCandidate(page), /Raja (brachyura|montagui)/);
    const hint = await page.$$eval('.key-panel .hint', (ps) => ps.map((p) => p.textContent).join('\n'));
    assert.match(hint, /cannot tell Raja (brachyura from Raja montagui|montagui from Raja brachyura)/);
  } finally {
    await context.close();
    server.stop();
  }
});

test('an observer sure only of the family records family Rajidae, sent and exported at that rank', async () => {
  const server = await startServer();
  const context = await phone(browser, HOME);
  try {
    const page = await openOnPhone(context, server);
    await page.click('#open-key');
    await page.waitForSelector('.key-question');
    const family = '.higher-rank[data-rank="family"][data-taxon="Rajidae"]';
    // Two answers as a skate shows itself; the family is offered with its support.
    await answerAs(page, taxon('Raja clavata'), async (said) => said.length >= 2 && (await page.$(family)) !== null);
    for (const rank of ['genus', 'family', 'order']) {
      assert.ok(await page.$(`.higher-rank[data-rank="${rank}"]`), `a ${rank} is offered`);
    }
    assert.equal(await page.$('.higher-rank[data-rank="superorder"]'), null, 'no rank above order on the observer\'s screen');
    assert.match(await page.textContent(family), /^(Suggested: )?skates — family Rajidae · \d+%$/);
    await page.click(family);
    await page.waitForSelector('#key-choice');
    assert.match(await page.textContent('#key-choice'), /Rajidae \(family/);
    assert.equal(await page.inputValue('#species'), 'skates — family Rajidae');

    await page.selectOption('#condition', 'fresh_dead');
    await page.selectOption('#setting', 'beach_stranding');
    await page.setInputFiles('#photo-input', demoPhoto('stingray.jpg'));
    await page.click('#save-send');
    await page.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 30000 });
    const [record] = await server.records();
    assert.equal(record.submission.key_choice.scientific_name, 'Rajidae');
    assert.equal(record.submission.key_choice.taxon_rank, 'family');
    const exported = await (await server.fetchSigned('/api/export?format=geojson&state=any')).json();
    const { properties } = exported.features[0];
    assert.equal(properties.scientificName, 'Rajidae');
    assert.equal(properties.taxonRank, 'family', 'Darwin Core taxonRank of the pick');
  } finally {
    await context.close();
    server.stop();
  }
});

test('confirmed records nearby raise a species, and the phone keeps them for flight mode', async () => {
  const server = await startServer();
  const context = await phone(browser, HOME);
  try {
    await confirmedRecord(server, 'a7000000-0000-4000-8000-000000000001', 'thornback ray', 'Raja clavata', { latitude: 52.30, longitude: -4.20 });
    const page = await openOnPhone(context, server);
    const area = 'wrackline.nearby.52.45,-4.05';
    const topReasons = async () => {
      await page.click('#open-key');
      await page.waitForFunction(() => /thornback ray/.test(document.querySelector('.candidate')?.textContent), null, { timeout: 10000 });
      return topCandidate(page);
    };
    // With nothing answered, one confirmed thornback ray within 50 km puts it first.
    assert.match(await topReasons(), /1 confirmed record nearby/);
    assert.ok(await page.evaluate((k) => localStorage.getItem(k), area), 'the answer is kept for this area');

    await context.setOffline(true);
    await page.reload();
    await page.waitForSelector('#open-key');
    assert.match(await topReasons(), /1 confirmed record nearby/, 'offline, from what the phone kept');
  } finally {
    await context.close();
    server.stop();
  }
});

test('answers a refreshed checklist no longer asks are set aside with a note, and the list stays', async () => {
  const server = await startServer();
  // No service worker here, so the page's own requests can be held back and changed.
  const context = await browser.newContext({ viewport: { width: 390, height: 844 }, serviceWorkers: 'block' });
  let release;
  const dropped = new Promise((resolve) => { release = resolve; });
  await context.route('**/api/checklist', async (route) => {
    const character = await dropped;
    const changed = structuredClone(checklist);
    changed.characters = changed.characters.filter((c) => c.name !== character);
    for (const t of changed.taxa) delete t.characters[character];
    // A checklist may not translate a character it lacks.
    for (const words of Object.values(changed.translations ?? {})) delete words.characters[character];
    await route.fulfill({ json: changed });
  });
  try {
    const page = await context.newPage();
    await page.goto(server.url);
    await page.click('#safety-ok', { timeout: 15000 });
    await page.click('#open-key');
    await page.waitForSelector('.key-question');
    const character = await page.$eval('.key-question', (q) => q.dataset.character);
    await page.click(`.key-question .state-choice[data-state="${stingray.characters[character][0]}"]`);
    release(character); // the server's checklist arrives without the character just answered
    await page.waitForSelector('.set-aside', { timeout: 10000 });
    assert.match(await page.textContent('.set-aside'), new RegExp(`your answer about ${character} \\(the checklist no longer asks it\\)`));
    assert.ok((await page.$$('.candidate')).length > 0, 'the candidates are still listed');
  } finally {
    await context.close();
    server.stop();
  }
});
