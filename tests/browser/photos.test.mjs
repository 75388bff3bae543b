// Photos on the phone, end to end in headless Chromium against the real server: the
// original's EXIF is read in the browser before anything re-encodes it (tags written by
// exiftool; meanings per CIPA DC-008), shown beside what the record says, and used to
// prefill the position when the device has no fix; the upload copy is upright and
// carries no EXIF (read back with exiftool); the phone's reading arrives as data and
// the server keeps it apart from its own. A HEIC file the browser cannot open is
// refused with words that say what to do; so is a photo on a browser too old to
// resize it, while one without OffscreenCanvas (iOS Safari before 16.4) still prepares
// it. A photo taken before a daylight-saving change keeps the phone's offset of that
// date. Removing a photo takes the position it filled with it; the same photo is not
// added twice.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { execFileSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { startServer, launchBrowser, screenshotPath, demoPhoto } from './harness.mjs';

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

const scratch = mkdtempSync(path.join(tmpdir(), 'wrackline-photos-'));

// The demo catshark drawing (960 × 720) with EXIF written by exiftool.
function photoWithExif(tags) {
  const file = path.join(scratch, `tagged-${Date.now()}.jpg`);
  copyFileSync(demoPhoto('catshark.jpg'), file);
  execFileSync('exiftool', ['-overwrite_original', '-all=', ...tags, file]);
  return file;
}

// Tag names exiftool (the reference reader) finds, by group.
function exiftoolTags(bytes) {
  const file = path.join(scratch, `read-${Date.now()}.jpg`);
  writeFileSync(file, bytes);
  const [found] = JSON.parse(execFileSync('exiftool', ['-json', '-G1', '-a', file]).toString());
  return Object.keys(found).filter((k) => !/^(SourceFile|ExifTool|System|File|Composite):?/.test(k));
}

// A phone whose location service gives no fix (`options` adds to the context's, e.g.
// its time zone).
async function phoneWithoutFix(options = {}) {
  const context = await browser.newContext({ viewport: { width: 390, height: 844 }, ...options });
  await context.addInitScript(() => Object.defineProperty(navigator, 'geolocation', {
    value: { getCurrentPosition: (_ok, fail) => fail({ message: 'no fix' }) },
  }));
  return context;
}

async function openApp(context, server) {
  const page = await context.newPage();
  page.on('pageerror', (err) => console.error('page error:', err.message));
  await page.goto(server.url);
  await page.click('#safety-ok', { timeout: 15000 });
  await page.waitForFunction(() => document.querySelector('#position-note')?.textContent.includes('no position from this phone'), null, { timeout: 10000 });
  return page;
}

test('a photo\'s EXIF is read on the phone, shown, prefills the position and travels as data', async () => {
  const server = await startServer();
  const context = await phoneWithoutFix();
  try {
    const page = await openApp(context, server);
    const tagged = photoWithExif([
      '-Orientation#=6', '-DateTimeOriginal=2025:06:01 09:30:00', '-OffsetTimeOriginal=+01:00', '-SubSecTimeOriginal=25',
      '-GPSLatitude=52.4601', '-GPSLatitudeRef=N', '-GPSLongitude=4.0829', '-GPSLongitudeRef=W', '-GPSHPositioningError=6',
    ]);
    await page.setInputFiles('#photo-input', tagged);
    await page.waitForSelector('.photo-says', { timeout: 10000 });
    const says = await page.textContent('.photo-says');
    // CIPA DC-008: DateTimeOriginal + SubSecTimeOriginal local time, OffsetTimeOriginal its offset; GPS rationals with N/W refs.
    assert.equal(says, 'photo says: 2025-06-01 09:30:00 (UTC+01:00, the camera\'s own time zone) · 52.46010, -4.08290 within 6 m');
    assert.equal(await page.inputValue('#latitude'), '52.460100');
    assert.equal(await page.inputValue('#longitude'), '-4.082900');
    assert.equal(await page.inputValue('#accuracy'), '6');
    assert.match(await page.textContent('#position-note'), /first photo/);
    assert.match(await page.textContent('#device-says'), /^this phone says: /);
    await page.screenshot({ path: screenshotPath('photo-exif-prefill'), fullPage: true });

    await page.fill('#species', 'small-spotted catshark');
    await page.selectOption('#condition', 'fresh_dead');
    await page.selectOption('#setting', 'beach_stranding');
    await page.click('#save-send');
    await page.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 20000 });

    const [record] = await server.records();
    assert.equal(record.submission.position.source, 'photo');
    const phone = record.submission.photo_exif[0];
    assert.equal(phone.taken_local, '2025:06:01 09:30:00.25');
    assert.equal(phone.orientation, 6);
    assert.ok(Math.abs(phone.latitude - 52.4601) < 1e-6 && Math.abs(phone.longitude + 4.0829) < 1e-6, JSON.stringify(phone));
    const photo = record.photos[0];
    // Orientation 6 (rotate 90° clockwise) applied on the phone: the 960 × 720 original arrives upright, 720 × 960.
    assert.deepEqual([photo.width, photo.height], [720, 960]);
    assert.equal(photo.exif.latitude, null, 'the upload copy carries no GPS');
    assert.equal(photo.phone_exif.taken_at, '2025-06-01T09:30:00.250+01:00');
    assert.equal(photo.check.time_reading, 'phone');
    assert.equal(photo.check.place_reading, 'phone');
    // The photo was taken earlier than the form's "now": its own time became the record's.
    assert.equal(Date.parse(record.submission.observed_at), Date.parse('2025-06-01T09:30:00+01:00'));
    assert.ok(!photo.check.flags.includes('taken_long_before_record'), JSON.stringify(photo.check));
    assert.ok(photo.check.metres_from_record < 0.1, 'the record took its position from the photo');

    const original = Buffer.from(await (await server.fetchSigned(`/photos/${photo.sha256}/original`)).arrayBuffer());
    const tags = exiftoolTags(original);
    assert.deepEqual(tags.filter((t) => t.startsWith('GPS:') || t.startsWith('ExifIFD:') || t.startsWith('IFD0:')), [], tags.join(', '));
  } finally {
    await context.close();
    server.stop();
  }
});

test('a HEIC photo the browser cannot open is refused with what to do', async () => {
  const server = await startServer();
  const context = await phoneWithoutFix();
  try {
    const page = await openApp(context, server);
    // The first bytes of an ISO-BMFF HEIC file ("ftypheic"); Chromium decodes no HEIC.
    const heic = Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from('ftypheic\0\0\0\0mif1heic'), Buffer.alloc(64)]);
    await page.setInputFiles('#photo-input', { name: 'IMG_0001.HEIC', mimeType: 'image/heic', buffer: heic });
    await page.waitForFunction(() => document.querySelector('#photo-note')?.textContent.includes('cannot open'), null, { timeout: 10000 });
    assert.match(await page.textContent('#photo-note'), /“IMG_0001\.HEIC” is a HEIC photo, which this browser cannot open\. .*Most Compatible/);
    assert.equal(await page.$$eval('.thumbs li', (items) => items.length), 0, 'nothing half-added');
  } finally {
    await context.close();
    server.stop();
  }
});

// The browser says wrackline's storage is all but used up (navigator.storage.estimate),
// as a phone with a full outbox would.
async function phoneWithStorage(usage, quota) {
  const context = await phoneWithoutFix();
  await context.addInitScript(([u, q]) => {
    navigator.storage.estimate = async () => ({ usage: u, quota: q });
  }, [usage, quota]);
  return context;
}

async function fillAndSave(page) {
  await page.setInputFiles('#photo-input', demoPhoto('ray.jpg'));
  await page.waitForSelector('.photo-says', { timeout: 10000 });
  await page.fill('#species', 'thornback ray');
  await page.selectOption('#condition', 'decomposed');
  await page.selectOption('#setting', 'beach_stranding');
  await page.click('#save-send');
}

test('a record that would not fit in the phone\'s storage is not saved, and the form and photo are kept', async () => {
  const server = await startServer();
  const context = await phoneWithStorage(99.9e6, 100e6);
  try {
    const page = await openApp(context, server);
    await fillAndSave(page);
    await page.waitForFunction(() => document.querySelector('#saved-note')?.textContent.startsWith('Not saved'), null, { timeout: 10000 });
    assert.match(await page.textContent('#saved-note'), /storage for wrackline is full .* Your form is kept as it is\./);
    assert.equal(await page.$$eval('.thumbs li', (items) => items.length), 1, 'the photo is still on the form');
    assert.equal(await page.inputValue('#species'), 'thornback ray');
    assert.equal(await page.$$eval('.outbox-entry', (items) => items.length), 0);
    assert.equal((await server.records()).length, 0);
  } finally {
    await context.close();
    server.stop();
  }
});

test('nearly full storage saves the record and warns', async () => {
  const server = await startServer();
  const context = await phoneWithStorage(85e6, 100e6);
  try {
    const page = await openApp(context, server);
    await fillAndSave(page);
    await page.waitForFunction(() => document.querySelector('#saved-note')?.textContent.includes('nearly full'), null, { timeout: 10000 });
    await page.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 20000 });
    assert.equal((await server.records()).length, 1);
  } finally {
    await context.close();
    server.stop();
  }
});

test('a large photo is sent as a copy with its long edge at 2048 px', async () => {
  const server = await startServer();
  const context = await phoneWithoutFix();
  try {
    const page = await openApp(context, server);
    // A 3000 × 2000 JPEG made by the page's own canvas.
    const base64 = await page.evaluate(async () => {
      const canvas = new OffscreenCanvas(3000, 2000);
      const context2d = canvas.getContext('2d');
      context2d.fillStyle = '#c9b48a';
      context2d.fillRect(0, 0, 3000, 2000);
      context2d.fillStyle = '#334';
      context2d.fillRect(400, 700, 2000, 500);
      const bytes = new Uint8Array(await (await canvas.convertToBlob({ type: 'image/jpeg', quality: 0.9 })).arrayBuffer());
      let text = '';
      for (let i = 0; i < bytes.length; i += 0x8000) text += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
      return btoa(text);
    });
    await page.setInputFiles('#photo-input', { name: 'large.jpg', mimeType: 'image/jpeg', buffer: Buffer.from(base64, 'base64') });
    await page.waitForSelector('.photo-says', { timeout: 10000 });
    await page.fill('#latitude', '52.4153');
    await page.fill('#longitude', '-4.0829');
    await page.selectOption('#condition', 'fresh_dead');
    await page.selectOption('#setting', 'beach_stranding');
    await page.click('#save-send');
    await page.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 20000 });
    const [record] = await server.records();
    assert.deepEqual([record.photos[0].width, record.photos[0].height], [2048, 1365]);
    assert.equal(record.photos[0].media_type, 'image/jpeg');
  } finally {
    await context.close();
    server.stop();
  }
});

async function sendForm(page) {
  await page.fill('#species', 'small-spotted catshark');
  await page.selectOption('#condition', 'fresh_dead');
  await page.selectOption('#setting', 'beach_stranding');
  await page.click('#save-send');
  await page.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 20000 });
}

// Browsers without these: OffscreenCanvas (iOS Safari before 16.4), and also
// createImageBitmap (iOS Safari before 15).
for (const missing of [['OffscreenCanvas'], ['OffscreenCanvas', 'createImageBitmap']]) {
  test(`a phone without ${missing.join(' or ')} still prepares an upright copy`, async () => {
    const server = await startServer();
    const context = await phoneWithoutFix();
    await context.addInitScript((names) => { for (const name of names) delete self[name]; }, missing);
    try {
      const page = await openApp(context, server);
      assert.deepEqual(await page.evaluate((names) => names.filter((name) => name in self), missing), [], 'the browser lacks them');
      await page.setInputFiles('#photo-input', photoWithExif(['-Orientation#=6']));
      await page.waitForSelector('.thumbs img', { timeout: 10000 });
      assert.equal(await page.textContent('#photo-note'), '');
      await sendForm(page);
      const [record] = await server.records();
      // Orientation 6 (CIPA DC-008: rotate 90° clockwise): the 960 × 720 drawing arrives 720 × 960.
      assert.deepEqual([record.photos[0].width, record.photos[0].height], [720, 960]);
      assert.equal(record.photos[0].media_type, 'image/jpeg');
    } finally {
      await context.close();
      server.stop();
    }
  });
}

test('a browser with no way to resize a photo says so in plain words and adds nothing', async () => {
  const server = await startServer();
  const context = await phoneWithoutFix();
  await context.addInitScript(() => { delete self.OffscreenCanvas; delete HTMLCanvasElement.prototype.toBlob; });
  try {
    const page = await openApp(context, server);
    await page.setInputFiles('#photo-input', demoPhoto('ray.jpg'));
    await page.waitForFunction(() => document.querySelector('#photo-note')?.textContent.includes('too old'), null, { timeout: 10000 });
    assert.match(await page.textContent('#photo-note'), /“ray\.jpg” could not be prepared for sending: this browser is too old to resize photos .* Update the phone's software .* then add the photo again\./);
    assert.equal(await page.$$eval('.thumbs li', (items) => items.length), 0);
  } finally {
    await context.close();
    server.stop();
  }
});

test('a photo taken before the clocks changed keeps the phone\'s offset of that date', async () => {
  // London: GMT (+00:00) until 01:00 UTC on Sunday 30 March 2025, then BST (+01:00)
  // (UK daylight saving starts the last Sunday of March, from memory; the tz database
  // in Chromium agrees). The photo has no OffsetTimeOriginal; the record is made after.
  const server = await startServer();
  const context = await phoneWithoutFix({ timezoneId: 'Europe/London' });
  try {
    const page = await openApp(context, server);
    await page.setInputFiles('#photo-input', photoWithExif(['-DateTimeOriginal=2025:03:29 14:00:00']));
    await page.waitForSelector('.photo-says', { timeout: 10000 });
    assert.equal(await page.textContent('.photo-says'), "photo says: 2025-03-29 14:00:00 (UTC+00:00, this phone's time zone on that date) · no position");
    await page.fill('#when', '2025-03-31T10:00');
    await page.fill('#latitude', '52.4153');
    await page.fill('#longitude', '-4.0829');
    await sendForm(page);
    const [record] = await server.records();
    assert.equal(record.submission.observed_at, '2025-03-31T10:00:00+01:00');
    const photo = record.photos[0];
    assert.equal(photo.phone_exif.device_offset, '+00:00');
    assert.equal(photo.phone_exif.offset_source, 'device');
    // The instant the phone showed, not one an hour off with the record's +01:00.
    assert.equal(photo.phone_exif.taken_at, '2025-03-29T14:00:00Z', 'RFC 3339 writes +00:00 as Z');
    assert.equal(photo.check.seconds_before_record, 43 * 3600);
  } finally {
    await context.close();
    server.stop();
  }
});

test('removing the photo whose GPS filled the position clears it; a typed position stays', async () => {
  const server = await startServer();
  const context = await phoneWithoutFix();
  try {
    const page = await openApp(context, server);
    const withGps = ['-GPSLatitude=52.4601', '-GPSLatitudeRef=N', '-GPSLongitude=4.0829', '-GPSLongitudeRef=W'];
    await page.setInputFiles('#photo-input', photoWithExif(withGps));
    await page.waitForSelector('.photo-says', { timeout: 10000 });
    assert.equal(await page.inputValue('#latitude'), '52.460100');
    await page.click('.remove-photo');
    await page.waitForFunction(() => document.querySelectorAll('.thumbs li').length === 0);
    assert.deepEqual([await page.inputValue('#latitude'), await page.inputValue('#longitude')], ['', '']);
    assert.match(await page.textContent('#position-note'), /removed photo/);

    await page.setInputFiles('#photo-input', photoWithExif(withGps));
    await page.waitForSelector('.photo-says', { timeout: 10000 });
    await page.fill('#latitude', '52.4700');
    await page.click('.remove-photo');
    await page.waitForFunction(() => document.querySelectorAll('.thumbs li').length === 0);
    assert.equal(await page.inputValue('#latitude'), '52.4700', 'a position the observer typed is theirs');
  } finally {
    await context.close();
    server.stop();
  }
});

test('the same photo picked twice is added once, and said so', async () => {
  const server = await startServer();
  const context = await phoneWithoutFix();
  try {
    const page = await openApp(context, server);
    await page.setInputFiles('#photo-input', demoPhoto('ray.jpg'));
    await page.waitForSelector('.thumbs img', { timeout: 10000 });
    await page.setInputFiles('#photo-input', demoPhoto('ray.jpg'));
    await page.waitForFunction(() => document.querySelector('#photo-note')?.textContent.includes('already added'), null, { timeout: 10000 });
    assert.equal(await page.textContent('#photo-note'), '“ray.jpg”: this photo is already added.');
    assert.equal(await page.$$eval('.thumbs li', (items) => items.length), 1);
    await page.fill('#latitude', '52.4153');
    await page.fill('#longitude', '-4.0829');
    await sendForm(page);
    assert.match(await page.textContent('.outbox-entry'), /· 1 photo(?!s)/);
    const [record] = await server.records();
    assert.equal(record.photos.length, 1);
  } finally {
    await context.close();
    server.stop();
  }
});
