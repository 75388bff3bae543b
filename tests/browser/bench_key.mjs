// Benchmark (not a test): how long the guided key takes to choose the next question in
// the browser, over invented checklists of 50 and 500 species, run in Debian's headless
// Chromium on the release build. `cargo xtask bench` runs it after the native benchmark
// (species-key/benches/next_question.rs) so both numbers come from the same run.
import { startServer, launchBrowser } from './harness.mjs';

const server = await startServer();
const browser = await launchBrowser();
try {
  const page = await browser.newPage();
  await page.goto(server.url);
  await page.waitForSelector('#safety-ok, #open-key');
  const result = await page.evaluate(async () => {
    const app = await import('/wrackline_app.js');
    app.bench_next_question(500, 20); // warm up
    return { small: app.bench_next_question(50, 2000), large: app.bench_next_question(500, 200) };
  });
  console.log(`browser (wasm, Chromium): next question, 50 species: ${(result.small * 1000).toFixed(1)} µs per call`);
  console.log(`browser (wasm, Chromium): next question, 500 species: ${(result.large * 1000).toFixed(1)} µs per call`);
  console.log(`browser: 500 / 50 species = ${(result.large / result.small).toFixed(1)}x`);
  console.log(`bench-row | key: next question in headless Chromium, release wasm (\`tests/browser/bench_key.mjs\`) | ${(result.large * 1000).toFixed(0)} µs (500 species) | 50 species: ${(result.small * 1000).toFixed(0)} µs | 500/50 = ${(result.large / result.small).toFixed(1)}× | —`);
} finally {
  await browser.close();
  server.stop();
}
