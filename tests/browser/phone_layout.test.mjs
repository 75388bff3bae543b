// Every screen of the app on a phone-sized screen (390 × 844 CSS px, a common phone
// size): the page never scrolls sideways (document.documentElement.scrollWidth ≤
// innerWidth; a wide table scrolls inside its own box instead), and every button is at
// least 44 px tall (common practice for touch targets: 44 pt in Apple's Human Interface
// Guidelines, from memory) — cold wet hands on a beach. The screens are opened on the
// demo records (`wrackline demo`), as the demo reviewer and the demo admin.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { startServer, launchBrowser, demoPhoto, phone, openOnPhone, screenshotPath } from './harness.mjs';

const SCREEN = { width: 390, height: 844 };
const TOUCH_TARGET_PX = 44;

let browser;
let server;
before(async () => {
  browser = await launchBrowser();
  server = await startServer({ demo: true });
});
after(async () => {
  await browser?.close();
  server?.stop();
});

// Checks the screen as it is now: no sideways scrolling of the page, buttons tall enough.
async function checkScreen(page, name) {
  await page.waitForFunction(() => [...document.images].every((image) => image.complete), null, { timeout: 10000 });
  await page.screenshot({ path: screenshotPath(`phone-${name}`), fullPage: true });
  const found = await page.evaluate((minimum) => {
    const describe = (el) => `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ''}${el.className && typeof el.className === 'string' ? `.${el.className.trim().replace(/\s+/g, '.')}` : ''} “${(el.textContent || '').trim().slice(0, 30)}”`;
    const visible = (el) => el.getClientRects().length > 0 && getComputedStyle(el).visibility !== 'hidden';
    const sticking_out = [...document.body.querySelectorAll('*')]
      .filter((el) => visible(el) && el.getBoundingClientRect().right > innerWidth + 0.5)
      .map((el) => `${describe(el)} to ${Math.round(el.getBoundingClientRect().right)} px`);
    const small = [...document.querySelectorAll('button, .button, select')]
      .filter((el) => visible(el) && el.getBoundingClientRect().height < minimum)
      .map((el) => `${describe(el)}: ${el.getBoundingClientRect().height.toFixed(1)} px`);
    return { scrollWidth: document.documentElement.scrollWidth, innerWidth, sticking_out, small };
  }, TOUCH_TARGET_PX);
  assert.ok(found.scrollWidth <= found.innerWidth,
    `${name}: the page is ${found.scrollWidth} px wide on a ${found.innerWidth} px screen; sticking out: ${found.sticking_out.slice(0, 8).join('; ')}`);
  assert.deepEqual(found.small, [], `${name}: buttons under ${TOUCH_TARGET_PX} px tall`);
}

async function signIn(page, person) {
  await page.goto(`${server.url}/desk/#review`);
  await page.fill('#username', person.username);
  await page.fill('#password', person.password);
  await page.click('#sign-in button[type=submit]');
}

test('the observer\'s screens fit a phone: record form with a photo, the key, walks, my records', async () => {
  const context = await phone(browser, { latitude: 52.4153, longitude: -4.0829, accuracy: 7 });
  try {
    const page = await openOnPhone(context, server);
    await checkScreen(page, 'record-form');
    // The language switch is one of the header's links, as wide as its words, not a line of its own.
    const switchWidth = await page.$eval('#language', (el) => el.getBoundingClientRect().width);
    assert.ok(switchWidth < SCREEN.width / 3, `the language switch is ${switchWidth} px wide on a ${SCREEN.width} px screen`);
    await page.click('#safety-link');
    await page.waitForSelector('#safety');
    await checkScreen(page, 'safety');
    await page.goto(`${server.url}/#`);
    await page.waitForSelector('#record-form');
    await page.setInputFiles('#photo-input', demoPhoto('catshark.jpg'));
    await page.waitForSelector('.thumbs img', { timeout: 10000 });
    await page.waitForSelector('#photo-time-note');
    await checkScreen(page, 'record-form-with-photo');

    await page.click('#open-key');
    await page.waitForSelector('.key-panel .state-choice');
    await checkScreen(page, 'key-open');
    await page.click('.key-panel .state-choice');
    await page.click('.key-panel details.answered summary');
    await checkScreen(page, 'key-answered');
    await page.click('#open-key');

    await page.click('#walk-start summary');
    await checkScreen(page, 'walk-start');
    await page.click('#start-walk');
    await page.waitForSelector('#walk-active');
    await checkScreen(page, 'walk-under-way');
    await page.click('#end-walk');
    await page.waitForSelector('.walk-entry');
    await checkScreen(page, 'walk-ended');

    await page.fill('#species', 'small-spotted catshark');
    await page.selectOption('#condition', 'fresh_dead');
    await page.selectOption('#setting', 'beach_stranding');
    await page.click('#save-send');
    await page.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 20000 });
    await page.click('#send-now');
    await page.waitForSelector('#my-records .my-record', { timeout: 15000 });
    await page.click('#my-records .my-record .answer summary');
    await checkScreen(page, 'my-records');
  } finally {
    await context.close();
  }
});

test('the reviewer\'s screens fit a phone: the queue, a record, figures', async () => {
  const context = await browser.newContext({ viewport: SCREEN });
  try {
    const page = await context.newPage();
    await signIn(page, server.demoPeople.reviewer);
    await page.waitForSelector('.queue-item', { timeout: 15000 });
    await checkScreen(page, 'review-queue');

    // A demo record in the queue with photos whose EXIF says when and where.
    const queued = await page.$$eval('.queue-item', (items) => items.map((item) => item.dataset.clientId));
    const withPhoto = (await server.records()).find((r) => queued.includes(r.submission.client_id)
      && r.photos.some((p) => p.exif.taken_at && p.exif.latitude !== null));
    assert.ok(withPhoto, 'the demo has a queued record with a photo that says when and where');
    await page.click(`.queue-item[data-client-id="${withPhoto.submission.client_id}"] button.link`);
    await page.waitForSelector('#record-review .when-where');
    await checkScreen(page, 'review-record');
    const cells = await page.$$eval('.when-where td', (tds) => tds.map((td) => td.textContent));
    const times = cells.filter((text) => /^\d{4}-\d\d-\d\d \d\d:\d\d [+-]\d\d:\d\d$/.test(text));
    assert.equal(times.length, 2, `the record's and the photo's time as people read them: ${cells.join(' | ')}`);
    assert.ok(!cells.some((text) => /\d\dT\d\d|:\d\d\.\d/.test(text)), `no machine timestamps: ${cells.join(' | ')}`);

    await page.goto(`${server.url}/desk/#figures`);
    await page.fill('#figures-taxon', 'Scyliorhinus canicula');
    // Every demo record, reviewed or not, so the map and chart have something to draw.
    await page.selectOption('#figures-state', 'any');
    await page.click('#figures-show');
    await page.waitForSelector('#range-map svg', { timeout: 15000 });
    await page.waitForSelector('#trend-chart svg', { timeout: 15000 });
    await checkScreen(page, 'figures');
  } finally {
    await context.close();
  }
});

test('the admin\'s people screen fits a phone', async () => {
  const context = await browser.newContext({ viewport: SCREEN });
  try {
    const page = await context.newPage();
    await signIn(page, server.demoPeople.admin);
    await page.click('a[href="#people"]');
    await page.waitForSelector('#people-list li', { timeout: 15000 });
    await checkScreen(page, 'people');
  } finally {
    await context.close();
  }
});
