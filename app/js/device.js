// Browser adapters for the app: the IndexedDB outbox, the position and storage
// persistence. Kept in plain JavaScript because an IndexedDB transaction closes as
// soon as its code awaits anything that is not IndexedDB, which a record and its
// photos must be saved inside. All decisions stay in Rust; this file only stores,
// fetches and reports.

const DB_NAME = 'wrackline';
const DB_VERSION = 3;

function request(req) {
  return new Promise((resolve, reject) => {
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error);
  });
}

function done(tx) {
  return new Promise((resolve, reject) => {
    tx.oncomplete = () => resolve();
    tx.onerror = () => reject(tx.error);
    tx.onabort = () => reject(tx.error || new Error('storage transaction aborted'));
  });
}

let opened = null;
function db() {
  if (!opened) {
    if (!self.indexedDB) {
      return Promise.reject(new Error('this browser offers no offline storage (IndexedDB)'));
    }
    const req = indexedDB.open(DB_NAME, DB_VERSION);
    req.onupgradeneeded = (event) => {
      const d = req.result;
      // Version 1: one row per record {id, json}; one row per photo {record_id, position, blob}.
      if (event.oldVersion < 1) {
        d.createObjectStore('entries', { keyPath: 'id' });
        const photos = d.createObjectStore('photos', { keyPath: ['record_id', 'position'] });
        photos.createIndex('by_record', 'record_id');
      }
      // Version 2: one row per survey walk {id, json}.
      if (event.oldVersion < 2) {
        d.createObjectStore('walks', { keyPath: 'id' });
      }
      // Version 3: one row per reply to a reviewer {id, json}; its photos go in
      // 'photos' under the reply's id.
      if (event.oldVersion < 3) {
        d.createObjectStore('replies', { keyPath: 'id' });
      }
    };
    opened = request(req);
  }
  return opened;
}

// Saves an entry of `store` ('entries' or 'replies') and, when `files` is given,
// replaces its photos, in one transaction.
export async function saveEntry(id, json, files, store = 'entries') {
  const d = await db();
  const tx = d.transaction([store, 'photos'], 'readwrite');
  tx.objectStore(store).put({ id, json });
  if (files) {
    const photos = tx.objectStore('photos');
    photos.delete(IDBKeyRange.bound([id, 0], [id, Number.MAX_SAFE_INTEGER]));
    files.forEach((blob, position) => photos.put({ record_id: id, position, blob }));
  }
  await done(tx);
}

// Every entry's JSON text, of `store` ('entries' or 'replies').
export async function listEntries(store = 'entries') {
  const d = await db();
  const rows = await request(d.transaction(store).objectStore(store).getAll());
  return rows.map((row) => row.json);
}

// The photos of one record, in order, as Blobs.
export async function photosOf(id) {
  const d = await db();
  const rows = await request(d.transaction('photos').objectStore('photos').index('by_record').getAll(id));
  rows.sort((a, b) => a.position - b.position);
  return rows.map((row) => row.blob);
}

// Removes a draft and its photos.
export async function deleteEntry(id) {
  const d = await db();
  const tx = d.transaction(['entries', 'photos'], 'readwrite');
  tx.objectStore('entries').delete(id);
  tx.objectStore('photos').delete(IDBKeyRange.bound([id, 0], [id, Number.MAX_SAFE_INTEGER]));
  await done(tx);
}

// Asks the browser not to evict the outbox under storage pressure.
export async function requestPersistence() {
  if (navigator.storage && navigator.storage.persist) {
    return await navigator.storage.persist();
  }
  return false;
}

// {usage, quota} in bytes, or null when the browser does not say.
export async function storageEstimate() {
  if (navigator.storage && navigator.storage.estimate) {
    const { usage, quota } = await navigator.storage.estimate();
    return { usage: usage || 0, quota: quota || 0 };
  }
  return null;
}

// The device's position: {latitude, longitude, accuracy, at} (accuracy in metres, at in
// milliseconds since 1970), no older than `maximumAgeMs` (0: a fresh fix).
export function currentPosition(maximumAgeMs = 60000) {
  return new Promise((resolve, reject) => {
    if (!navigator.geolocation) {
      reject(new Error('this device offers no position'));
      return;
    }
    navigator.geolocation.getCurrentPosition(
      (p) => resolve({ latitude: p.coords.latitude, longitude: p.coords.longitude, accuracy: p.coords.accuracy, at: p.timestamp }),
      (err) => reject(new Error(err.message || 'position unavailable')),
      { enableHighAccuracy: true, timeout: 20000, maximumAge: maximumAgeMs },
    );
  });
}

// The browser's offer to install the app (its `beforeinstallprompt` event), kept until the
// observer presses "Install"; `wrackline-installable` tells the app it may show the button.
let installOffer = null;
self.addEventListener('beforeinstallprompt', (event) => {
  event.preventDefault();
  installOffer = event;
  self.dispatchEvent(new Event('wrackline-installable'));
});

export function canInstall() {
  return installOffer !== null;
}

// Shows the browser's own install question; true when the observer accepted.
export async function install() {
  const offer = installOffer;
  if (!offer) return false;
  installOffer = null;
  await offer.prompt();
  const choice = await offer.userChoice;
  return choice?.outcome === 'accepted';
}

// Sends one record with its photos; resolves to {status, body} whatever the status,
// and rejects only when no answer came (no network, connection lost).
// `part` names the JSON part ('record', or 'reply'); `headers` may carry the device
// identity.
export async function sendRecord(url, json, blobs, part = 'record', headers = {}) {
  const form = new FormData();
  form.append(part, json);
  blobs.forEach((blob, i) => form.append('photo', blob, `photo-${i + 1}.jpg`));
  const response = await fetch(url, { method: 'POST', body: form, headers });
  return { status: response.status, body: await response.text() };
}

// Saves a survey walk's JSON.
export async function saveWalk(id, json) {
  const d = await db();
  const tx = d.transaction('walks', 'readwrite');
  tx.objectStore('walks').put({ id, json });
  await done(tx);
}

// Every walk's JSON text.
export async function listWalks() {
  const d = await db();
  const rows = await request(d.transaction('walks').objectStore('walks').getAll());
  return rows.map((row) => row.json);
}

// Follows the device's position, calling `onFix({latitude, longitude, accuracy, at})`
// (at in milliseconds since 1970) or `onError(message)`; returns the id to stop with.
export function watchPosition(onFix, onError) {
  if (!navigator.geolocation) {
    onError('this device offers no position');
    return -1;
  }
  return navigator.geolocation.watchPosition(
    (p) => onFix({ latitude: p.coords.latitude, longitude: p.coords.longitude, accuracy: p.coords.accuracy, at: p.timestamp }),
    (err) => onError(err.message || 'position unavailable'),
    { enableHighAccuracy: true, maximumAge: 5000, timeout: 60000 },
  );
}

export function stopWatching(id) {
  if (id >= 0 && navigator.geolocation) navigator.geolocation.clearWatch(id);
}

// Sends JSON with `method`; resolves to {status, body}, rejects only when no answer came.
// `json` may be null for a request without a body; `headers` adds to the defaults.
export async function sendJson(method, url, json, headers = {}) {
  const init = { method, headers: { ...headers }, credentials: 'same-origin' };
  if (json !== null && json !== undefined) {
    init.body = json;
    init.headers['content-type'] = 'application/json';
  }
  const response = await fetch(url, init);
  return { status: response.status, body: await response.text() };
}

// The bytes of a picked file, for reading its EXIF before anything re-encodes it.
export async function readBytes(file) {
  return new Uint8Array(await file.arrayBuffer());
}

// SHA-256 of a picked file as 64 lower-case hex digits, so the server can tell the same
// original picked on two phones (whose upload copies differ). null where the browser
// offers no digest (crypto.subtle exists only on https and on this machine's own
// addresses); the record is then sent without it.
export async function originalSha256(file) {
  if (!globalThis.crypto?.subtle) return null;
  const digest = await crypto.subtle.digest('SHA-256', await file.arrayBuffer());
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

// Makes the upload copy of a photo with the browser's own decoder: upright, long edge
// at most `longEdge` px, re-encoded as JPEG. The canvas writes no EXIF, so the copy
// carries no GPS; the phone sends what it read from the original as data instead.
// Resolves to {blob, sha256} (sha256: hex of the copy, or null where the browser
// cannot hash). Rejects with {undecodable: true} when this browser cannot decode the
// format (HEIC in Chromium), and with {noCanvas: true} when it has no canvas that can
// save a picture.
//
// Routes, fastest first, so older phones still prepare photos: decoding with
// createImageBitmap (`imageOrientation: 'from-image'` applies the EXIF Orientation),
// else an <img> (browsers apply the Orientation to images themselves); drawing on an
// OffscreenCanvas (`convertToBlob`), else on a <canvas> element (`toBlob`) — iOS
// Safari before 16.4 has no OffscreenCanvas.
export async function prepareUpload(file, longEdge, quality) {
  const picture = await decodeUpright(file);
  try {
    const scale = Math.min(1, longEdge / Math.max(picture.width, picture.height));
    const width = Math.max(1, Math.round(picture.width * scale));
    const height = Math.max(1, Math.round(picture.height * scale));
    const surface = drawingSurface(width, height);
    surface.context.imageSmoothingQuality = 'high';
    surface.context.drawImage(picture.image, 0, 0, width, height);
    const blob = await surface.encode('image/jpeg', quality);
    return { blob, sha256: await sha256Hex(blob) };
  } finally {
    picture.release();
  }
}

function undecodable(err) {
  const error = new Error(`this browser cannot read this photo (${err && err.message ? err.message : 'not a picture it knows'})`);
  error.undecodable = true;
  return error;
}

// The picture, upright, as something a canvas can draw: {image, width, height, release}.
async function decodeUpright(file) {
  if (typeof self.createImageBitmap === 'function') {
    let bitmap;
    try {
      bitmap = await createImageBitmap(file, { imageOrientation: 'from-image' });
    } catch (err) {
      throw undecodable(err);
    }
    return { image: bitmap, width: bitmap.width, height: bitmap.height, release: () => bitmap.close() };
  }
  const url = URL.createObjectURL(file);
  const image = new Image();
  try {
    image.src = url;
    await image.decode();
  } catch (err) {
    URL.revokeObjectURL(url);
    throw undecodable(err);
  }
  return { image, width: image.naturalWidth, height: image.naturalHeight, release: () => URL.revokeObjectURL(url) };
}

// A 2-D canvas of the given size and how to save it: {context, encode(type, quality)}.
function drawingSurface(width, height) {
  if (typeof self.OffscreenCanvas === 'function') {
    const canvas = new OffscreenCanvas(width, height);
    const context = canvas.getContext('2d');
    if (context && typeof canvas.convertToBlob === 'function') {
      return { context, encode: (type, quality) => canvas.convertToBlob({ type, quality }) };
    }
  }
  if (typeof document !== 'undefined') {
    const canvas = document.createElement('canvas');
    canvas.width = width;
    canvas.height = height;
    const context = canvas.getContext('2d');
    if (context && typeof canvas.toBlob === 'function') {
      const encode = (type, quality) => new Promise((resolve, reject) => {
        canvas.toBlob((blob) => (blob ? resolve(blob) : reject(new Error('the canvas could not save the picture'))), type, quality);
      });
      return { context, encode };
    }
  }
  const error = new Error('neither OffscreenCanvas nor canvas.toBlob is available');
  error.noCanvas = true;
  throw error;
}

// SHA-256 of a Blob as lower-case hex, or null where the browser offers no hashing
// (crypto.subtle exists only on secure pages).
async function sha256Hex(blob) {
  if (!self.crypto || !crypto.subtle) return null;
  const digest = new Uint8Array(await crypto.subtle.digest('SHA-256', await blob.arrayBuffer()));
  return Array.from(digest, (b) => b.toString(16).padStart(2, '0')).join('');
}
