// Starts the app: loads the wasm module and registers the service worker that keeps the
// app on the phone for flight mode. A file of its own (not inline in index.html), so the
// page's Content-Security-Policy can allow scripts from this site only.
import init from '/wrackline_app.js';

init({ module_or_path: '/wrackline_app_bg.wasm' }).catch((err) => {
  const words = document.getElementById('loading-words');
  if (words) words.textContent = `wrackline could not start (${err && err.message ? err.message : err}). Check the connection and reload the page.`;
  console.error('wrackline could not start:', err);
});
if ('serviceWorker' in navigator) {
  navigator.serviceWorker.register('/sw.js').catch((err) => console.error('offline support unavailable:', err));
}
