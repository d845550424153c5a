// A copy of the Lixiv engine on a Web Worker: the page sends it the
// compiled module once, then one sample of an inversion at a time (the
// budget with the first sample of each job); it answers with the sample's
// result, its progress, or why it could not. The same main.wasm as the
// page's runs here: without a document it serves the page instead of
// drawing it.
"use strict";
importScripts("wasm_exec.js");
var handler = null;
var waiting = [];

// lixivServe is called by the engine with its handler of requests.
self.lixivServe = function (f) {
  handler = f;
  waiting.forEach(function (m) { f(m); });
  waiting = [];
};

// lixivPost is called by the engine with a sample's bytes (and the
// milliseconds it worked on it), an error, or its progress (0 to 1).
self.lixivPost = function (id, sample, bytes, error, progress, ms) {
  if (bytes) {
    self.postMessage({ id: id, sample: sample, bytes: bytes, ms: ms }, [bytes.buffer]);
  } else if (error) {
    self.postMessage({ id: id, sample: sample, error: error });
  } else {
    self.postMessage({ id: id, sample: sample, progress: progress });
  }
};

self.onmessage = function (ev) {
  var m = ev.data;
  if (m.module) {
    var go = new Go();
    WebAssembly.instantiate(m.module, go.importObject)
      .then(function (inst) { return go.run(inst); })
      .then(function () { self.postMessage({ fatal: "its engine stopped" }); })
      .catch(function (e) { self.postMessage({ fatal: String(e) }); });
    return;
  }
  if (handler) { handler(m); } else { waiting.push(m); }
};
