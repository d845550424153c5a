// Starts the Lixiv page: registers the offline service worker and runs the
// page's WebAssembly. The page's content security policy forbids eval; the
// renderer's helper script is loaded from vugu-render.js instead, so the
// renderer's own eval of it is answered here without evaluating anything.
"use strict";
(function () {
  window.eval = function () {
    if (window.vuguRender) { return undefined; }
    throw new Error("eval is disabled on this page");
  };
  window.lixivBoot = { start: performance.now() };
  if ("serviceWorker" in navigator && (location.protocol === "https:" || location.hostname === "127.0.0.1" || location.hostname === "localhost")) {
    navigator.serviceWorker.register("sw.js").catch(function (e) { console.warn("service worker:", e); });
  }
  function fail(e) {
    var el = document.getElementById("lixiv");
    if (el) { el.textContent = "The notebook could not start: " + e; }
    console.error(e);
  }
  // The module is compiled once, while it streams in, and kept as
  // lixivBoot.module (a promise of a WebAssembly.Module) for anything else
  // that runs it. Compiled from the response the service worker keeps, a
  // second visit reuses the browser's cache of the compiled code.
  window.lixivBoot.module = WebAssembly.compileStreaming(fetch("main.wasm"));
  var go = new Go();
  window.lixivBoot.module
    .then(function (m) { window.lixivBoot.compiled = performance.now(); return WebAssembly.instantiate(m, go.importObject); })
    .then(function (instance) { return go.run(instance); })
    .catch(fail);
})();
