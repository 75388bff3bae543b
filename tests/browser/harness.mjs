// Shared pieces of the browser tests: the real wrackline binary on a free port with a
// fresh data directory, and Debian's Chromium driven by playwright-core.
import { spawn } from 'node:child_process';
import { mkdtempSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium } from 'playwright-core';

const required = (name) => {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: run these tests with \`cargo xtask test\``);
  return value;
};

// Starts `wrackline serve` on 127.0.0.1:0 and resolves once it prints its address.
export async function startServer() {
  const dataDir = mkdtempSync(path.join(tmpdir(), 'wrackline-browser-'));
  const child = spawn(required('WRACKLINE_BIN'), [
    '--data-dir', dataDir, 'serve', '--bind', '127.0.0.1:0', '--app-dir', required('WRACKLINE_APP_DIR'),
  ], { stdio: ['ignore', 'pipe', 'inherit'] });
  const url = await new Promise((resolve, reject) => {
    let seen = '';
    const timer = setTimeout(() => reject(new Error(`server did not start: ${seen}`)), 20000);
    child.stdout.on('data', (chunk) => {
      seen += chunk;
      const match = seen.match(/listening on (http:\/\/127\.0\.0\.1:\d+)/);
      if (match) { clearTimeout(timer); resolve(match[1]); }
    });
    child.on('exit', (code) => { clearTimeout(timer); reject(new Error(`server exited with ${code}: ${seen}`)); });
  });
  return {
    url,
    dataDir,
    async records() {
      const response = await fetch(`${url}/api/observations`);
      if (!response.ok) throw new Error(`listing records: ${response.status}`);
      return response.json();
    },
    stop() { child.kill('SIGTERM'); },
  };
}

// Chromium as root in a closed network: no sandbox, no background traffic.
export function launchBrowser() {
  return chromium.launch({
    executablePath: process.env.CHROMIUM || '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
      '--disable-component-update', '--disable-sync'],
  });
}

export function screenshotPath(name) {
  const dir = path.join(process.cwd(), 'target', 'screenshots');
  mkdirSync(dir, { recursive: true });
  return path.join(dir, `${name}.png`);
}

export function demoPhoto(name) {
  return path.join(required('WRACKLINE_DEMO_PHOTOS'), name);
}
