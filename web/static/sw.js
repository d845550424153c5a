// Lixiv's offline cache: after one visit every file of the page is served
// from here, so the notebook reloads and works with no network. The build
// stamps VERSION from a hash of the files, so a new build installs a new cache.
"use strict";
const VERSION = "dev";
const CACHE = "lixiv-" + VERSION;
const FILES = ["./", "index.html", "app.css", "boot.js", "vugu-render.js", "wasm_exec.js",
  "main.wasm", "demo.lixiv.json", "worker.js", "icon.svg"];

self.addEventListener("install", function (e) {
  e.waitUntil(caches.open(CACHE).then(function (c) { return c.addAll(FILES); }).then(function () { return self.skipWaiting(); }));
});

self.addEventListener("activate", function (e) {
  e.waitUntil(caches.keys().then(function (keys) {
    return Promise.all(keys.filter(function (k) { return k !== CACHE; }).map(function (k) { return caches.delete(k); }));
  }).then(function () { return self.clients.claim(); }));
});

self.addEventListener("fetch", function (e) {
  const req = e.request;
  if (req.method !== "GET" || new URL(req.url).origin !== self.location.origin) { return; }
  e.respondWith(caches.open(CACHE).then(function (c) {
    return c.match(req, { ignoreSearch: true, ignoreVary: true }).then(function (hit) {
      return hit || fetch(req).then(function (resp) {
        if (resp.ok) { c.put(req, resp.clone()); }
        return resp;
      });
    });
  }));
});
