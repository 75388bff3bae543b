// Starts the desk: loads its wasm module. A file of its own (not inline), so the page's
// Content-Security-Policy can allow scripts from this site only. The desk registers no
// service worker: it needs a connection, and the phone's worker keeps only the phone's
// files.
import init from '/desk/wrackline_desk.js';

init({ module_or_path: '/desk/wrackline_desk_bg.wasm' }).catch((err) => {
  const words = document.getElementById('loading-words');
  if (words) words.textContent = `The wrackline desk could not start (${err && err.message ? err.message : err}). Check the connection and reload the page.`;
  console.error('wrackline desk could not start:', err);
});
