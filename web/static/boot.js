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
  var go = new Go();
  WebAssembly.instantiateStreaming(fetch("main.wasm"), go.importObject)
    .then(function (r) { return go.run(r.instance); })
    .catch(fail);
})();
