// What a browser enforces for wrackline, seen in Chromium: the Content-Security-Policy
// (and that the harness would catch a violation of it), a page on another site that
// tries to sign a visitor in or frame the app, and the observer's choice about being
// named in open data travelling from the About you card to the exports.
import { test, before, after } from 'node:test';
import assert from 'node:assert/strict';
import { createServer } from 'node:http';
import { execFileSync } from 'node:child_process';

import { startServer, launchBrowser, phone, openOnPhone, eventually, takeCspViolations, REVIEWER } from './harness.mjs';

let browser;
before(async () => { browser = await launchBrowser(); });
after(async () => { await browser?.close(); });

// A stranger's site on another port of this machine (another origin), serving `html`.
async function strangerSite(html) {
  const site = createServer((_, response) => {
    response.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
    response.end(html);
  });
  await new Promise((resolve) => site.listen(0, '127.0.0.1', resolve));
  return { url: `http://127.0.0.1:${site.address().port}/`, close: () => site.close() };
}

test('the app runs under its Content-Security-Policy, and a violation is caught', async () => {
  const server = await startServer();
  const context = await browser.newContext();
  try {
    const page = await context.newPage();
    const response = await page.goto(server.url);
    // W3C CSP Level 3: the policy the server sends with the page.
    assert.match(response.headers()['content-security-policy'], /script-src 'self' 'wasm-unsafe-eval'/);
    await page.click('#safety-ok', { timeout: 15000 });
    assert.deepEqual(takeCspViolations(), [], 'the app itself breaks nothing in the policy');
    // An injected inline script and an inline style attribute are refused and reported:
    // the harness sees them (this is its negative control), so any test that causes one fails.
    const ran = await page.evaluate(() => {
      const script = document.createElement('script');
      script.textContent = 'window.injected = true;';
      document.body.append(script);
      document.body.setAttribute('style', 'background: red');
      return window.injected === true;
    });
    assert.equal(ran, false, 'the inline script did not run');
    const seen = [];
    await eventually('both violations reported', () => {
      seen.push(...takeCspViolations());
      return seen.length >= 2;
    });
    assert.ok(seen.some((v) => /inline script/i.test(v)), seen.join('\n'));
    assert.ok(seen.some((v) => /inline style/i.test(v)), seen.join('\n'));
  } finally {
    await context.close();
    server.stop();
  }
});

test('a page on another site can neither sign a visitor in nor show the app in a frame', async () => {
  const server = await startServer();
  // Login CSRF: the attacker's own sign-in, posted by a form as text/plain (no preflight
  // needed). A text/plain form sends `name=value`, so the JSON is split at an `=` inside
  // the password: the body is exactly {"username":"stranger","password":"stranger=pass-2026"}.
  execFileSync(process.env.WRACKLINE_BIN, ['--data-dir', server.dataDir, 'user', 'add', '--username', 'stranger', '--role', 'reviewer'],
    { env: { ...process.env, WRACKLINE_PASSWORD: 'stranger=pass-2026' }, stdio: ['ignore', 'ignore', 'inherit'] });
  const stranger = await strangerSite(`<!doctype html>
    <form id="f" method="post" action="${server.url}/api/session" enctype="text/plain">
      <input type="hidden" name='{"username":"stranger","password":"stranger' value='pass-2026"}'>
    </form>
    <iframe id="framed" src="${server.url}/"></iframe>`);
  const context = await browser.newContext();
  try {
    const page = await context.newPage();
    await page.goto(stranger.url);
    // frame-ancestors 'none' (and X-Frame-Options: DENY): the browser refuses to show it.
    const refusedFrame = await eventually('the frame refused', () => takeCspViolations().find((v) => /frame-ancestors/.test(v)));
    assert.ok(refusedFrame);
    await Promise.all([page.waitForNavigation(), page.evaluate(() => document.getElementById('f').submit())]);
    const answer = await page.textContent('body');
    assert.match(answer, /refused/, answer);
    assert.deepEqual(await context.cookies(server.url), [], 'no session was started');
  } finally {
    await context.close();
    stranger.close();
    server.stop();
  }
});

// Confirms a record through the API as the reviewer (JSON, CSRF token, no page).
async function confirmAsReviewer(server, clientId, name) {
  const login = await fetch(`${server.url}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(REVIEWER) });
  const { csrf_token: csrf } = await login.json();
  const cookie = login.headers.get('set-cookie').split(';')[0];
  const answer = await fetch(`${server.url}/api/review/records/${clientId}/actions`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', cookie, 'x-csrf-token': csrf },
    body: JSON.stringify({ action: 'confirm', scientific_name: name, taxon_rank: 'species' }),
  });
  assert.equal(answer.status, 200, await answer.text());
}

test('the About you card asks whether to publish the name, and the answer reaches the exports', async () => {
  const server = await startServer();
  const handset = await phone(browser, { latitude: 52.4153, longitude: -4.0829, accuracy: 7 });
  try {
    const page = await openOnPhone(handset, server);
    await page.fill('#species', 'small-spotted catshark');
    await page.selectOption('#condition', 'fresh_dead');
    await page.selectOption('#setting', 'beach_stranding');
    await page.click('#save-send');
    await page.waitForFunction(() => document.querySelector('.outbox-entry')?.textContent.includes('received by the server'), null, { timeout: 20000 });
    await page.waitForSelector('#about-you');
    assert.match(await page.textContent('#about-you'), /Publish my name with my records in open data/);
    assert.equal(await page.isChecked('#about-name-public'), false, 'no, unless the observer says yes');
    await page.fill('#about-name', 'Invented Namer');
    await page.check('#about-name-public');
    await page.click('#about-save');
    await page.waitForFunction(() => /^Saved: your records go as Invented Namer.*open data name you/.test(document.querySelector('#about-note')?.textContent));
    assert.equal(await page.getAttribute('#about-you', 'open'), null, 'folded to one line once saved');

    const [record] = await server.records();
    await confirmAsReviewer(server, record.submission.client_id, 'Scyliorhinus canicula');
    // The public export names the observer once the phone has sent the answer.
    const named = await eventually('the public export names the observer', async () => {
      const csv = await (await fetch(`${server.url}/api/export?format=csv`)).text();
      return csv.includes('Invented Namer') ? csv : null;
    });
    assert.match(named, /Invented Namer/);
  } finally {
    await handset.close();
    server.stop();
  }
});
