// The same original photo picked on two phones: the phone names each original it reads
// by its SHA-256 (crypto.subtle) and sends that with its EXIF reading; the upload copies
// differ from phone to phone, the originals' digests do not, and the server makes the two
// records candidates of each other "the same original photo", at any distance.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { startServer, launchBrowser, demoPhoto, phone, openOnPhone } from './harness.mjs';

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

const SECOND = 'f0000000-0000-4000-8000-000000000002';

test('two records sharing an original photo end up as candidates with that reason', async () => {
  const server = await startServer();
  const handset = await phone(browser, { latitude: 52.489, longitude: -4.053, accuracy: 9 });
  try {
    const observer = await openOnPhone(handset, server);
    await observer.fill('#species', 'thornback ray');
    await observer.selectOption('#condition', 'fresh_dead');
    await observer.selectOption('#setting', 'beach_stranding');
    await observer.setInputFiles('#photo-input', demoPhoto('ray.jpg'));
    await observer.waitForSelector('.thumbs img');
    await observer.click('#save-send');
    await observer.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 20000 });

    // FIPS 180-4 SHA-256 by node's crypto (OpenSSL), the reference for the phone's digest.
    const original = readFileSync(demoPhoto('ray.jpg'));
    const digest = createHash('sha256').update(original).digest('hex');
    const [first] = await server.records();
    assert.equal(first.photos[0].phone_exif.original_sha256, digest, 'the phone sent the digest of the original it read');
    assert.notEqual(first.photos[0].sha256, digest, 'the file sent is the upload copy, not the original');

    // Another phone, 40 km away three weeks later, with another guess and another upload
    // copy (here another picture's bytes stand for its re-encoding) of the same original.
    const record = {
      client_id: SECOND, observed_at: new Date(Date.now() - 3600e3).toISOString().replace('Z', '+00:00'),
      position: { latitude: 52.85, longitude: -4.1, accuracy_m: 12, source: 'device' },
      species_guess: 'spurdog', length: null, sex: 'unknown', count: 1, condition: 'decomposed',
      setting: 'beach_stranding', human_signs: [], notes: null, observer_name: 'Second walker',
      photo_exif: [{ original_sha256: digest }],
    };
    const form = new FormData();
    form.append('record', JSON.stringify(record));
    form.append('photo', new Blob([readFileSync(demoPhoto('stingray.jpg'))], { type: 'image/jpeg' }), 'copy.jpg');
    const sent = await fetch(`${server.url}/api/observations`, { method: 'POST', body: form });
    assert.equal(sent.status, 200, await sent.text());

    const detail = await server.get(`/api/review/records/${first.submission.client_id}`);
    const pair = detail.duplicates.find((d) => d.other.submission.client_id === SECOND);
    assert.ok(pair, `a candidate: ${JSON.stringify(detail.duplicates)}`);
    assert.equal(pair.score, 1);
    assert.match(pair.reasons.join(' '), /the same original photo, picked on both phones/);
  } finally {
    await handset.close();
    server.stop();
  }
});
