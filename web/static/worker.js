// The Lixiv compute worker: runs the engine-only worker.wasm so that long
// Monte Carlo runs leave the page responsive. Messages that arrive before
// the Go side is ready are queued and handed over once it sets lixivJob.
"use strict";
importScripts("wasm_exec.js");
var queue = [];
self.onmessage = function (e) { queue.push(e.data); };
self.lixivReady = function () {
  var q = queue; queue = [];
  self.onmessage = function (e) { self.lixivJob(e.data); };
  q.forEach(function (m) { self.lixivJob(m); });
};
var go = new Go();
WebAssembly.instantiateStreaming(fetch("worker.wasm"), go.importObject)
  .then(function (r) { return go.run(r.instance); })
  .catch(function (e) { self.postMessage({ kind: "fatal", error: String(e) }); });
