// Benchmark (not a test): how long the phone takes to make the upload copy of a
// 12-megapixel JPEG (4000 × 3000, EXIF Orientation 6) in headless Chromium, two ways in
// the same run: the app's own `prepareUpload` (browser decoder via createImageBitmap,
// OffscreenCanvas, JPEG at 0.88, long edge 2048), and the `image` crate compiled to wasm
// (`tests/upload-copy-bench`, built by `cargo xtask bench` into WRACKLINE_BENCH_WASM).
// Also the whole pick as the observer meets it: the file given to the form's photo
// input until its thumbnail is on the form (EXIF read in wasm from the file's start,
// the upload copy, its hash, the form redrawn). Prints the median and range of several
// runs, with the browser's decode alone as the baseline.
//
//   cargo xtask build --dev && cargo build -p wrackline-server &&
//   WRACKLINE_BIN=target/debug/wrackline WRACKLINE_APP_DIR=target/app-dist \
//   WRACKLINE_DEMO_PHOTOS=demo-records/photos WRACKLINE_BENCH_WASM=target/bench-wasm \
//   node tests/browser/bench_prepare.mjs        (or simply: cargo xtask bench)
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { startServer, launchBrowser } from './harness.mjs';

const RUNS = 7;

function deviceModulePath(appDir) {
  const snippets = path.join(appDir, 'snippets');
  const crate = readdirSync(snippets).find((name) => name.startsWith('wrackline-app-'));
  return `/snippets/${crate}/js/device.js`;
}

const median = (values) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];

const server = await startServer();
const browser = await launchBrowser();
try {
  // No service worker: it would answer the benchmark module's requests before page.route.
  const context = await browser.newContext({ serviceWorkers: 'block' });
  const page = await context.newPage();
  const benchWasm = process.env.WRACKLINE_BENCH_WASM;
  if (benchWasm) {
    await page.route('**/bench-wasm/*', (route) => {
      const name = path.basename(new URL(route.request().url()).pathname);
      const type = name.endsWith('.wasm') ? 'application/wasm' : 'text/javascript';
      route.fulfill({ body: readFileSync(path.join(benchWasm, name)), contentType: type });
    });
  }
  await page.goto(server.url);
  await page.click('#safety-ok', { timeout: 15000 });
  // A photo-like 12 MP JPEG made in the page: smooth gradients plus fine noise, so it
  // compresses like a photo (several MB), not like a flat colour.
  const jpegBase64 = await page.evaluate(async () => {
    const canvas = new OffscreenCanvas(4000, 3000);
    const context = canvas.getContext('2d');
    const gradient = context.createLinearGradient(0, 0, 4000, 3000);
    gradient.addColorStop(0, '#d9c6a0');
    gradient.addColorStop(1, '#5a7d8c');
    context.fillStyle = gradient;
    context.fillRect(0, 0, 4000, 3000);
    const noise = context.getImageData(0, 0, 4000, 3000);
    for (let i = 0; i < noise.data.length; i += 4) {
      const n = ((i * 2654435761) >>> 24) - 128;
      noise.data[i] += n >> 2; noise.data[i + 1] += n >> 2; noise.data[i + 2] += n >> 3;
    }
    context.putImageData(noise, 0, 0);
    const blob = await canvas.convertToBlob({ type: 'image/jpeg', quality: 0.92 });
    const bytes = new Uint8Array(await blob.arrayBuffer());
    let text = '';
    for (let i = 0; i < bytes.length; i += 0x8000) text += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
    return btoa(text);
  });
  const dir = mkdtempSync(path.join(tmpdir(), 'wrackline-bench-'));
  const file = path.join(dir, 'twelve-megapixels.jpg');
  writeFileSync(file, Buffer.from(jpegBase64, 'base64'));
  execFileSync('exiftool', ['-overwrite_original', '-Orientation#=6', '-GPSLatitude=52.4153', '-GPSLatitudeRef=N', file]);
  const bytes = readFileSync(file);

  const result = await page.evaluate(async ({ base64, modulePath, runs, withWasm }) => {
    const raw = Uint8Array.from(atob(base64), (c) => c.charCodeAt(0));
    const photo = new File([raw], 'twelve-megapixels.jpg', { type: 'image/jpeg' });
    const { prepareUpload } = await import(modulePath);
    const decode = [];
    const prepare = [];
    let copy;
    for (let i = 0; i < runs; i += 1) {
      let start = performance.now();
      const bitmap = await createImageBitmap(photo, { imageOrientation: 'from-image' });
      decode.push(performance.now() - start);
      bitmap.close();
      start = performance.now();
      copy = await prepareUpload(photo, 2048, 0.88);
      prepare.push(performance.now() - start);
    }
    const check = await createImageBitmap(copy.blob);
    const wasm = [];
    let wasmSize = null;
    if (withWasm) {
      const bench = await import('/bench-wasm/upload_copy_bench.js');
      const wasmBytes = await (await fetch('/bench-wasm/upload_copy_bench_bg.wasm')).arrayBuffer();
      await bench.default({ module_or_path: wasmBytes });
      let out;
      for (let i = 0; i < runs; i += 1) {
        const start = performance.now();
        out = bench.upload_copy(raw, 2048, 88);
        wasm.push(performance.now() - start);
      }
      const wasmCheck = await createImageBitmap(new Blob([out], { type: 'image/jpeg' }));
      wasmSize = [wasmCheck.width, wasmCheck.height];
    }
    // The whole pick, through the form: the photo given to the input until its
    // thumbnail shows; then removed, so the next run is not "already added".
    const input = document.querySelector('#photo-input');
    const thumbs = () => document.querySelectorAll('.thumbs li').length;
    const pick = [];
    for (let i = 0; i < runs; i += 1) {
      const files = new DataTransfer();
      files.items.add(photo);
      const start = performance.now();
      input.files = files.files;
      input.dispatchEvent(new Event('change', { bubbles: true }));
      while (thumbs() === 0) await new Promise((resolve) => setTimeout(resolve, 2));
      pick.push(performance.now() - start);
      document.querySelector('.thumbs .remove-photo').click();
      while (thumbs() !== 0) await new Promise((resolve) => setTimeout(resolve, 2));
    }
    return { decode, prepare, pick, wasm, wasmSize, copyBytes: copy.blob.size, copySize: [check.width, check.height] };
  }, { base64: bytes.toString('base64'), modulePath: deviceModulePath(process.env.WRACKLINE_APP_DIR), runs: RUNS, withWasm: Boolean(benchWasm) });

  const fmt = (list) => `median ${median(list).toFixed(0)} ms (min ${Math.min(...list).toFixed(0)}, max ${Math.max(...list).toFixed(0)})`;
  console.log(`12 MP JPEG: ${(bytes.length / 1e6).toFixed(1)} MB, 4000 × 3000, Orientation 6; ${RUNS} runs in headless Chromium`);
  console.log(`  decode only (createImageBitmap, baseline): ${fmt(result.decode)}`);
  console.log(`  upload copy (decode + orient + scale + JPEG): ${fmt(result.prepare)}`);
  console.log(`  ratio upload copy / decode: ${(median(result.prepare) / median(result.decode)).toFixed(2)}`);
  console.log(`  whole pick on the form (EXIF from the file's start + upload copy + hash + thumbnail): ${fmt(result.pick)}`);
  console.log(`  copy: ${result.copySize.join(' × ')} px, ${(result.copyBytes / 1e6).toFixed(2)} MB`);
  const wasmWords = result.wasm.length ? `; image crate in wasm: ${median(result.wasm).toFixed(0)} ms` : '';
  console.log(`bench-row | phone upload copy, 12 MP JPEG, headless Chromium (\`tests/browser/bench_prepare.mjs\`) | ${median(result.prepare).toFixed(0)} ms (whole pick ${median(result.pick).toFixed(0)} ms) | decode only: ${median(result.decode).toFixed(0)} ms${wasmWords} | copy / decode ${(median(result.prepare) / median(result.decode)).toFixed(2)}× | —`);
  if (result.wasm.length) {
    console.log(`  image crate in wasm (decode + orient + scale + JPEG): ${fmt(result.wasm)}, copy ${result.wasmSize.join(' × ')} px`);
    console.log(`  ratio wasm / browser route: ${(median(result.wasm) / median(result.prepare)).toFixed(2)}`);
  } else {
    console.log('  (WRACKLINE_BENCH_WASM not set: the image-crate-in-wasm route was not measured)');
  }
} finally {
  await browser.close();
  server.stop();
}
