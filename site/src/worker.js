// The engine's worker. It runs from a Blob URL (the only kind of worker a page
// opened from file:// may start), receives the compiled WebAssembly module (or
// its bytes) from the page, starts the Go program and serves calls one at a
// time. It never fetches anything. wasm_exec.js (from the Go distribution) is
// prepended to this text by the page assembler.
'use strict';
let engine = null;

function reply(id, text) { postMessage({ type: 'reply', id, reply: text }); }

async function init(msg) {
  const go = new Go();
  let mod = msg.module;
  if (!(mod instanceof WebAssembly.Module)) {
    mod = await WebAssembly.compile(msg.bytes);
  }
  const inst = await WebAssembly.instantiate(mod, go.importObject);
  await new Promise((resolve, reject) => {
    self.rootshiftReady = resolve;
    go.run(inst).then(() => {
      engine = null;
      postMessage({ type: 'fatal', message: 'the engine stopped' });
    }, reject);
  });
  engine = self.rootshiftEngine;
  postMessage({ type: 'ready', version: engine.version, shared: msg.module instanceof WebAssembly.Module });
}

function call(msg) {
  const a = msg.args || {};
  if (!engine) {
    return JSON.stringify({ ok: false, error: { kind: 'internal', message: 'the engine is not running' } });
  }
  switch (msg.op) {
    case 'analyze':
      return engine.analyze(a.name, a.bytes, a.settings, (p) => {
        postMessage({ type: 'progress', id: msg.id, progress: JSON.parse(p) });
      });
    case 'plan':
      return engine.plan(a.name, a.bytes, a.settings, !!a.pilot);
    case 'part':
      return engine.part(a.name, a.bytes, a.settings, JSON.stringify(a.units), (p) => {
        postMessage({ type: 'progress', id: msg.id, progress: JSON.parse(p) });
      });
    case 'assemble':
      return engine.assemble(a.name, a.bytes, a.settings, JSON.stringify(a.parts), !!a.partial);
    case 'inspect':
      return engine.inspect(a.name, a.bytes, a.settings);
    case 'export':
      return engine.export(a.format);
    case 'plots':
      return engine.plots(a.index);
    case 'bench':
      return engine.bench(a.n);
    case 'about':
      return engine.about();
    case 'demo':
      return engine.demo();
  }
  return JSON.stringify({ ok: false, error: { kind: 'usage', message: 'unknown call ' + msg.op } });
}

self.onmessage = (e) => {
  const msg = e.data;
  if (msg.type === 'init') {
    init(msg).catch((err) => postMessage({ type: 'fatal', message: String(err && err.message || err) }));
    return;
  }
  if (msg.type === 'call') {
    let out;
    try {
      out = call(msg);
    } catch (err) {
      // A Go program that has exited throws on every call: report it so the page restarts the worker.
      out = JSON.stringify({ ok: false, error: { kind: 'internal', message: String(err && err.message || err) } });
      if (!engine || /exited/.test(String(err))) {
        postMessage({ type: 'fatal', message: String(err) });
      }
    }
    reply(msg.id, out);
  }
};
