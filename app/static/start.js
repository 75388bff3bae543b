// Starts the app and registers the service worker. A file of its own, not an inline
// script, so the Content-Security-Policy can allow scripts from this origin only.
import init from '/wrackline_app.js';

init({ module_or_path: '/wrackline_app_bg.wasm' });
if ('serviceWorker' in navigator) {
  navigator.serviceWorker.register('/sw.js').catch((err) => console.error('offline support unavailable:', err));
}
