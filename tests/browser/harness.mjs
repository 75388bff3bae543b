// Shared pieces of the browser tests: the real wrackline binary on a free port with a
// fresh data directory, and Debian's Chromium driven by playwright-core. Every page
// runs under the Content-Security-Policy the server sends, and a test during which any
// page reports a violation of it fails.
import { spawn, execFileSync } from 'node:child_process';
import { mkdtempSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium } from 'playwright-core';

const required = (name) => {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: run these tests with \`cargo xtask test\``);
  return value;
};

export const REVIEWER = { username: 'browser-reviewer', password: 'browser-reviewer-pass' };
export const ADMIN = { username: 'browser-admin', password: 'browser-admin-pass' };
export const RESPONDER = { username: 'browser-responder', password: 'browser-responder-pass' };

// Starts `wrackline serve` on 127.0.0.1:0 with a reviewer, an admin and a responder
// sign-in made by `wrackline user add`, and resolves once it prints its address. With `{ demo: true }`
// it runs `wrackline demo` instead: the demo records and walks loaded, and the demo
// sign-ins it prints kept in `demoPeople` ({reviewer, admin} as {username, password}).
// `env` adds to the server's environment (operator settings such as
// WRACKLINE_RESPONDERS_PHONE).
export async function startServer({ demo = false, env = {} } = {}) {
  const dataDir = mkdtempSync(path.join(tmpdir(), 'wrackline-browser-'));
  for (const [person, role] of [[REVIEWER, 'reviewer'], [ADMIN, 'admin'], [RESPONDER, 'responder']]) {
    execFileSync(required('WRACKLINE_BIN'), ['--data-dir', dataDir, 'user', 'add', '--username', person.username, '--role', role],
      { env: { ...process.env, WRACKLINE_PASSWORD: person.password }, stdio: ['ignore', 'ignore', 'inherit'] });
  }
  const child = spawn(required('WRACKLINE_BIN'), [
    '--data-dir', dataDir, demo ? 'demo' : 'serve', '--bind', '127.0.0.1:0', '--app-dir', required('WRACKLINE_APP_DIR'),
  ], { stdio: ['ignore', 'pipe', 'inherit'], env: { ...process.env, ...env } });
  const demoPeople = {};
  const url = await new Promise((resolve, reject) => {
    let seen = '';
    const timer = setTimeout(() => reject(new Error(`server did not start: ${seen}`)), demo ? 90000 : 20000);
    child.stdout.on('data', (chunk) => {
      seen += chunk;
      for (const [, role, username, password] of seen.matchAll(/demo sign-in \((\w+)\): username (\S+), password (\S+)/g)) {
        demoPeople[role] = { username, password };
      }
      const match = seen.match(/listening on (http:\/\/127\.0\.0\.1:\d+)/);
      if (match) { clearTimeout(timer); resolve(match[1]); }
    });
    child.on('exit', (code) => { clearTimeout(timer); reject(new Error(`server exited with ${code}: ${seen}`)); });
  });
  let session = null;
  // GETs a path as the signed-in reviewer; the raw response.
  async function fetchSigned(pathname) {
    if (!session) {
      const login = await fetch(`${url}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(REVIEWER) });
      if (!login.ok) throw new Error(`reviewer sign-in: ${login.status}`);
      session = login.headers.get('set-cookie').split(';')[0];
    }
    const response = await fetch(`${url}${pathname}`, { headers: { cookie: session } });
    if (!response.ok) throw new Error(`GET ${pathname}: ${response.status}`);
    return response;
  }
  const get = async (pathname) => (await fetchSigned(pathname)).json();
  return {
    url,
    dataDir,
    demoPeople,
    get,
    fetchSigned,
    records: () => get('/api/observations'),
    stop() { child.kill('SIGTERM'); },
  };
}

// Content-Security-Policy violations reported by any page since the last test ended,
// each with the page it happened on. Chromium reports every violation on the console
// ("Refused to … because it violates the following Content Security Policy directive").
const cspViolations = [];

export function isCspViolation(text) {
  return /Content Security Policy/i.test(text);
}

function watchPage(page) {
  page.on('console', (message) => {
    if (isCspViolation(message.text())) cspViolations.push(`${page.url()}: ${message.text()}`);
  });
}

// The violations seen so far, emptying the list.
export function takeCspViolations() {
  return cspViolations.splice(0);
}

// Under `node --test`, each test fails if a page reported a violation while it ran.
if (process.env.NODE_TEST_CONTEXT) {
  const { afterEach } = await import('node:test');
  afterEach(() => {
    const seen = takeCspViolations();
    if (seen.length > 0) throw new Error(`Content-Security-Policy violations:\n${seen.join('\n')}`);
  });
}

// Chromium as root in a closed network: no sandbox, no background traffic. Every page
// of every context it opens is watched for CSP violations.
export async function launchBrowser() {
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM || '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
      '--disable-component-update', '--disable-sync'],
  });
  // browser.newPage() goes through newContext() too.
  const newContext = browser.newContext.bind(browser);
  browser.newContext = async (...options) => {
    const context = await newContext(...options);
    context.on('page', watchPage);
    return context;
  };
  return browser;
}

export function screenshotPath(name) {
  const dir = path.join(process.cwd(), 'target', 'screenshots');
  mkdirSync(dir, { recursive: true });
  return path.join(dir, `${name}.png`);
}

// Signs in over HTTP, as a desk's browser would, for set-up calls: the session cookie
// and the CSRF token.
export async function signInApi(server, person = REVIEWER) {
  const response = await fetch(`${server.url}/api/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(person) });
  if (!response.ok) throw new Error(`sign-in: ${response.status}`);
  const body = await response.json();
  return { cookie: response.headers.get('set-cookie').split(';')[0], csrf: body.csrf_token };
}

// A reviewer's decision on a record, sent over HTTP (set-up for the observer's side).
export async function reviewAction(server, clientId, action) {
  const staff = await signInApi(server);
  const response = await fetch(`${server.url}/api/review/records/${clientId}/actions`, {
    method: 'POST', headers: { 'content-type': 'application/json', cookie: staff.cookie, 'x-csrf-token': staff.csrf },
    body: JSON.stringify(action),
  });
  if (!response.ok) throw new Error(`review action: ${response.status} ${await response.text()}`);
}

// Sends a record straight to the API, as a phone would (`token`: the phone's identity).
export async function sendRecord(server, record, token = null) {
  const form = new FormData();
  form.append('record', JSON.stringify(record));
  const headers = token ? { authorization: `Bearer ${token}` } : {};
  const response = await fetch(`${server.url}/api/observations`, { method: 'POST', body: form, headers });
  if (response.status !== 200) throw new Error(`record: ${response.status} ${await response.text()}`);
}

// A plain record for set-up, `hoursAgo` before now.
export function plainRecord(clientId, guess, { hoursAgo = 3, latitude = 52.4153, longitude = -4.0829 } = {}) {
  return {
    client_id: clientId, observed_at: new Date(Date.now() - hoursAgo * 3600e3).toISOString().replace('Z', '+00:00'),
    position: { latitude, longitude, accuracy_m: 10, source: 'device' }, species_guess: guess, length: null,
    sex: 'unknown', count: 1, condition: 'fresh_dead', setting: 'beach_stranding', human_signs: [], notes: null,
    observer_name: 'Invented Walker',
  };
}

export function demoPhoto(name) {
  return path.join(required('WRACKLINE_DEMO_PHOTOS'), name);
}

// A phone in Chromium at `position` (latitude, longitude, accuracy in metres).
export function phone(browser, { latitude, longitude, accuracy }) {
  return browser.newContext({ viewport: { width: 390, height: 844 }, geolocation: { latitude, longitude, accuracy }, permissions: ['geolocation'] });
}

// Opens the app on `context`, reads the safety cautions away and waits until the
// service worker controls the page (so the app opens offline from here on).
export async function openOnPhone(context, server) {
  const page = await context.newPage();
  page.on('pageerror', (err) => console.error('page error:', err.message));
  await page.goto(server.url);
  await page.click('#safety-ok', { timeout: 15000 });
  await page.waitForFunction(() => navigator.serviceWorker?.controller, null, { timeout: 15000 });
  return page;
}

// Asks `check` (sync or async) again every `every` ms until it returns something truthy,
// and returns that. After `timeout` ms it throws an Error naming `what` never happened
// and the last answer seen. For conditions outside the page (the server's state); inside
// the page, `page.waitForFunction` does the same.
export async function eventually(what, check, { timeout = 15000, every = 100 } = {}) {
  const deadline = Date.now() + timeout;
  for (;;) {
    const answer = await check();
    if (answer) return answer;
    if (Date.now() >= deadline) {
      throw new Error(`${what}: not seen within ${timeout} ms (last answer: ${JSON.stringify(answer)})`);
    }
    await new Promise((resolve) => setTimeout(resolve, every));
  }
}

// Presses "Send now" and returns once that sync round has finished: a round ends by
// asking the server for the phone's records (GET /api/my/records), and the status line
// says "sending…" until the last round has ended.
export async function sendNowAndWait(page) {
  const asked = page.waitForRequest((request) => new URL(request.url()).pathname === '/api/my/records', { timeout: 15000 });
  await page.click('#send-now');
  await (await asked).response();
  await page.waitForFunction(() => document.querySelector('#sync-status')?.textContent !== 'sending…', null, { timeout: 15000 });
}
