// Starts the Lixiv page: registers the offline service worker, compiles the
// page's WebAssembly once, starts the Web Workers that compute (each an
// instance of the same compiled module) and runs the page's own instance,
// which draws. The page's content security policy forbids eval; the
// renderer's helper script is loaded from vugu-render.js instead, so the
// renderer's own eval of it is answered here without evaluating anything.
"use strict";
(function () {
  window.eval = function () {
    if (window.vuguRender) { return undefined; }
    throw new Error("eval is disabled on this page");
  };
  window.lixivBoot = { start: performance.now() };
  // The offline service worker is registered, and the workers started,
  // once the page has painted its first render (lixivBoot.painted, which
  // the page calls), or a few seconds after the load: on a first visit the
  // service worker fetches and stores every file, which would take the
  // cores the first render draws with.
  var registered = false;
  function register() {
    if (registered) { return; }
    registered = true;
    if ("serviceWorker" in navigator && (location.protocol === "https:" || location.hostname === "127.0.0.1" || location.hostname === "localhost")) {
      navigator.serviceWorker.register("sw.js").catch(function (e) { console.warn("service worker:", e); });
    }
  }
  window.lixivBoot.painted = function () {
    register();
    if (window.lixivPool && window.lixivPool.start) { window.lixivPool.start(); }
  };
  window.addEventListener("load", function () { setTimeout(register, 3000); });
  function fail(e) {
    var el = document.getElementById("lixiv");
    if (el) { el.textContent = "The notebook could not start: " + e; }
    console.error(e);
  }

  // How many workers: one per core, at most the setting "workers" (the
  // page's address, ?workers=N, else browser storage "lixiv.workers",
  // else 4); 0 computes on the page's own thread.
  function wanted() {
    var v = new URLSearchParams(location.search).get("workers");
    if (v === null) {
      try { v = localStorage.getItem("lixiv.workers"); } catch (e) { v = null; }
    }
    var cap = (v === null || v === "" || isNaN(Number(v))) ? 4 : Math.max(0, Math.floor(Number(v)));
    return Math.min(cap, navigator.hardwareConcurrency || 1);
  }

  // note says in the page, small, that it computes on its own thread.
  function note(text) {
    var p = document.createElement("p");
    p.id = "compute-note";
    p.className = "compute-note";
    p.textContent = text;
    document.body.appendChild(p);
  }

  // pool hands the samples of an inversion to the workers, one at a time
  // to each, and reports each sample's bytes, the progress, or the first
  // error, naming the worker. Cancelling a job, or a job's error, ends the
  // workers still busy with it and starts fresh ones from the module.
  function pool(module, size) {
    // stats sums, over the jobs done, their time from start to last result
    // and the time the workers spent on their samples (for the timing
    // harness: what the page's side of a job costs).
    var p = { size: 0, jobs: 0, run: null, stats: { jobs: 0, wall: 0, busy: 0 } };
    if (size < 1) {
      note("Computing on the page's own thread (workers=0).");
      return p;
    }
    if (typeof Worker === "undefined") {
      note("This browser offers no Web Workers: the notebook computes on the page's own thread, so the page may pause during long runs.");
      return p;
    }
    var slots = [], job = null, seq = 0;
    function spawn(i) {
      var w = new Worker("worker.js");
      var slot = { n: i + 1, worker: w, busy: null, job: 0, out: 0 };
      w.onmessage = function (ev) { message(slot, ev.data); };
      w.onerror = function (ev) { ev.preventDefault(); lost(slot, ev.message || "a script error"); };
      w.postMessage({ module: module });
      slots[i] = slot;
    }
    function respawn(slot) {
      slot.worker.terminate();
      spawn(slot.n - 1);
    }
    function stop() {
      var id = job && job.id;
      job = null;
      slots.forEach(function (s) { if (s.busy !== null && s.busy === id) { respawn(s); } });
    }
    function failed(text) {
      var j = job;
      stop();
      j.onError(text);
    }
    function lost(slot, why) {
      var had = job && slot.busy === job.id;
      respawn(slot);
      if (had) { failed("worker " + slot.n + " of " + slots.length + " stopped: " + why); }
    }
    // feed hands each worker up to ahead samples at a time. Two (the next
    // waiting in the worker's queue while it works one) measured no faster
    // than one, the demo 4.5 s against 4.1 s and the 100-sample
    // catchment-wide budget 4.4 s against 3.9 s (medians of 8 and 5): a
    // queue holds back, at a job's end, work an idle worker could take.
    var ahead = 1;
    function feed(slot) {
      if (!job) { return; }
      if (slot.busy !== job.id) { slot.out = 0; }
      // (A worker lost as it is handed a sample ends the job, or is replaced, inside postMessage.)
      while (job && slots[slot.n - 1] === slot && slot.out < ahead && job.next < job.n) {
        var s = job.samples[job.next++], m = { id: job.id, sample: s, cell: job.cell, sulfate: job.sulfate, rough: job.rough };
        if (slot.job !== job.id) { m.doc = job.doc; m.state = job.state; slot.job = job.id; }
        slot.busy = job.id;
        slot.out++;
        slot.worker.postMessage(m);
      }
    }
    function report() {
      var f = 0;
      for (var k in job.frac) { f += job.frac[k]; }
      job.onProgress(f / job.n);
    }
    function message(slot, m) {
      if (m.fatal) { lost(slot, m.fatal); return; }
      if (!job || m.id !== job.id) { return; }
      if (m.bytes === undefined && !m.error) { job.frac[m.sample] = m.progress; report(); return; }
      if (--slot.out <= 0) { slot.busy = null; }
      if (m.error) { failed("worker " + slot.n + " of " + slots.length + ": " + m.error); return; }
      job.frac[m.sample] = 1;
      job.got++;
      job.busy += m.ms || 0;
      var j = job;
      if (j.got === j.n) {
        job = null;
        p.stats.jobs++;
        p.stats.wall += performance.now() - j.t0;
        p.stats.busy += j.busy;
      }
      j.onSample(m.sample, m.bytes);
      if (job) { report(); feed(slot); }
    }
    // The workers start once the page has painted its first render
    // (lixivBoot.painted), or with the first job: started with the page,
    // they would take the cores it draws with.
    var started = false;
    p.start = function () {
      if (started) { return; }
      started = true;
      for (var i = 0; i < size; i++) { spawn(i); }
    };
    p.size = size;
    // run starts a job (ending the one before) for the samples listed
    // (their numbers; or the chains or samples of a round of the
    // catchment-wide model, whose state each worker gets with the budget)
    // and returns its cancel.
    p.run = function (doc, cell, sulfate, rough, samples, onSample, onProgress, onError, state) {
      p.start();
      if (job) { stop(); }
      var id = ++seq;
      p.jobs++;
      job = { id: id, doc: doc, state: state || null, cell: cell, sulfate: sulfate, rough: rough, samples: samples, n: samples.length, next: 0, got: 0, frac: {}, t0: performance.now(), busy: 0,
        onSample: onSample, onProgress: onProgress, onError: onError };
      slots.forEach(feed);
      return function () { if (job && job.id === id) { stop(); } };
    };
    return p;
  }

  // The module is compiled once, while it streams in, and kept as
  // lixivBoot.module (a promise of a WebAssembly.Module) for the workers
  // and anything else that runs it. Compiled from the response the service
  // worker keeps, a second visit reuses the browser's cache of the compiled
  // code.
  window.lixivBoot.module = WebAssembly.compileStreaming(fetch("main.wasm"));
  window.lixivBoot.module.then(function () { window.lixivBoot.compiled = performance.now(); }, function () {});
  var go = new Go();
  // The script runs in the head, so the module can be ready (from the
  // service worker's cache) before the body that holds the mount point is
  // parsed: the page waits for the document before it runs.
  var parsed = new Promise(function (resolve) {
    if (document.readyState !== "loading") { resolve(); return; }
    document.addEventListener("DOMContentLoaded", function () { resolve(); }, { once: true });
  });
  Promise.all([window.lixivBoot.module, parsed])
    .then(function (got) {
      var module = got[0];
      window.lixivPool = pool(module, wanted());
      return WebAssembly.instantiate(module, go.importObject);
    })
    .then(function (instance) { return go.run(instance); })
    .catch(fail);
})();
