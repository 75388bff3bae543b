// The guided key in the phone, offline: questions with pictures, "not sure" changing
// nothing, candidates narrowing as the observer answers a stingray's features, one tap
// to pick, and the pick with its answers reaching the server with the record.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { startServer, launchBrowser, screenshotPath, demoPhoto, phone, openOnPhone } from './harness.mjs';

const checklist = JSON.parse(readFileSync(process.env.WRACKLINE_CHECKLIST, 'utf8'));
const stingray = checklist.taxa.find((t) => t.scientificName === 'Dasyatis pastinaca');

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

async function topCandidate(page) {
  return page.$eval('.candidate', (li) => li.textContent);
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

    // Answer as the animal shows itself, until the key is sure or has nothing to ask.
    for (let step = 0; step < 15; step++) {
      const character = await page.$eval('.key-question', (q) => q.dataset.character).catch(() => null);
      if (!character) break;
      const state = stingray.characters[character]?.[0];
      if (state) await page.click(`.key-question .state-choice[data-state="${state}"]`);
      else await page.click('.state-choice.not-sure');
      await page.waitForTimeout(50);
      if (/(\d+)%/.exec(await topCandidate(page))?.[1] >= 90) break;
    }
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
    assert.equal(choice.answers.tailSpine ?? stingray.characters.tailSpine[0], stingray.characters.tailSpine[0]);
    assert.deepEqual(record.flags, [], 'a 42 cm stingray in Cardigan Bay raises no flag');
  } finally {
    await context.close();
    server.stop();
  }
});
