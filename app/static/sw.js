// wrackline's service worker: keeps the phone's app shell so it opens with no network.
// The build writes the cache version (a hash of every file it lists) and the file
// list below; a new build means a new version, a fresh cache and the old one removed.
const CACHE = 'wrackline-__CACHE_VERSION__';
const SHELL = __SHELL_FILES__;

self.addEventListener('install', (event) => {
  event.waitUntil(caches.open(CACHE).then((cache) => cache.addAll(SHELL)).then(() => self.skipWaiting()));
});

self.addEventListener('activate', (event) => {
  event.waitUntil(
    caches.keys()
      .then((keys) => Promise.all(keys.filter((k) => k.startsWith('wrackline-') && k !== CACHE).map((k) => caches.delete(k))))
      .then(() => self.clients.claim()),
  );
});

// The shell is answered from the cache first (a beach rarely has good signal); the
// API and photos always go to the network, so the outbox sees real answers. The server
// sends the shell compressed with `Vary: Accept-Encoding`; the cache keeps the decoded
// file, the same whatever the encoding, so the match ignores Vary.
self.addEventListener('fetch', (event) => {
  const url = new URL(event.request.url);
  if (event.request.method !== 'GET' || url.origin !== self.location.origin) return;
  if (url.pathname.startsWith('/api/') || url.pathname.startsWith('/photos/') || url.pathname === '/healthz') return;
  // The desk (its own bundle, for reviewers and responders) needs a connection and is
  // not kept: it always comes from the network, never as the phone's page.
  if (url.pathname === '/desk' || url.pathname.startsWith('/desk/')) return;
  if (event.request.mode === 'navigate') {
    event.respondWith(caches.match('/index.html', { ignoreVary: true }).then((hit) => hit || fetch(event.request)));
    return;
  }
  event.respondWith(caches.match(event.request, { ignoreVary: true }).then((hit) => hit || fetch(event.request)));
});
