// The page: reads the analyst's data, sends it to the engine (Go compiled to
// WebAssembly, running in a Web Worker started from a Blob URL) and shows the
// findings. Nothing leaves the browser: the page's Content-Security-Policy
// forbids every connection, and this script makes none.
(() => {
  'use strict';
  const t0 = performance.now();
  const $ = (id) => document.getElementById(id);
  const timings = { loadStart: t0 };

  // ---------- engine (worker) ----------

  class EngineError extends Error {
    constructor(kind, message) { super(message); this.kind = kind; this.name = 'EngineError'; }
  }

  function b64ToBytes(b64) {
    if (typeof Uint8Array.fromBase64 === 'function') return Uint8Array.fromBase64(b64);
    const s = atob(b64);
    const out = new Uint8Array(s.length);
    for (let i = 0; i < s.length; i++) out[i] = s.charCodeAt(i);
    return out;
  }

  async function loadWasm() {
    const el = $('rs-wasm');
    const gz = b64ToBytes(el.textContent.trim());
    el.textContent = ''; // free the text
    timings.base64 = performance.now() - t0;
    const gunzip = () => new Blob([gz]).stream().pipeThrough(new DecompressionStream('gzip'));
    let module = null;
    try {
      // Compile while unpacking; the Response is built here from local bytes, nothing is fetched.
      module = await WebAssembly.compileStreaming(new Response(gunzip(), { headers: { 'Content-Type': 'application/wasm' } }));
    } catch (e) {
      module = null;
    }
    timings.compiled = performance.now() - t0;
    // Without a compiled module (an engine that cannot stream-compile), the worker compiles the bytes.
    const bytes = module ? null : await new Response(gunzip()).arrayBuffer();
    return { bytes, module };
  }

  const workerURL = URL.createObjectURL(new Blob([$('rs-worker').textContent], { type: 'text/javascript' }));

  class Engine {
    constructor(wasm) {
      this.wasm = wasm;
      this.seq = 0;
      this.pending = new Map();
      this.failures = 0; // consecutive failures before the engine became ready
      this.start();
    }
    start() {
      this.worker = new Worker(workerURL);
      this.ready = new Promise((resolve, reject) => { this.readyResolve = resolve; this.readyReject = reject; });
      this.ready.catch(() => {});
      this.worker.onmessage = (e) => this.onMessage(e.data);
      this.worker.onerror = (e) => { e.preventDefault(); this.fail('the engine failed: ' + (e.message || 'unknown error')); };
      this.worker.postMessage({ type: 'init', module: this.wasm.module, bytes: this.wasm.bytes });
    }
    onMessage(m) {
      if (m.type === 'ready') {
        this.version = m.version;
        this.failures = 0;
        // Whether the worker got the page's compiled module (not the bytes to compile again).
        timings.sharedModule = m.shared;
        this.readyResolve(m.version);
        return;
      }
      if (m.type === 'fatal') { this.fail(m.message); return; }
      const p = this.pending.get(m.id);
      if (!p) return;
      if (m.type === 'progress') { if (p.onProgress) p.onProgress(m.progress); return; }
      if (m.type === 'reply') {
        this.pending.delete(m.id);
        let r;
        try { r = JSON.parse(m.reply); } catch (e) { p.reject(new EngineError('internal', 'unreadable reply')); return; }
        if (r.ok) p.resolve(r.result); else p.reject(new EngineError(r.error.kind, r.error.message));
      }
    }
    fail(message) {
      // Shown on the console so that the browser tests see engine failures.
      console.error('rootshift engine: ' + message);
      const err = new EngineError('internal', message);
      this.readyReject(err);
      if (++this.failures > 2) {
        // The engine cannot start in this browser: stop retrying.
        this.worker.terminate();
        for (const p of this.pending.values()) p.reject(err);
        this.pending.clear();
        this.ready = Promise.reject(err);
        this.ready.catch(() => {});
        return;
      }
      this.restart(err);
    }
    restart(err) {
      this.worker.terminate();
      for (const p of this.pending.values()) p.reject(err);
      this.pending.clear();
      this.start();
    }
    cancel() { this.restart(new EngineError('cancelled', 'cancelled')); }
    call(op, args, onProgress, transfer) {
      return this.ready.then(() => new Promise((resolve, reject) => {
        const id = ++this.seq;
        this.pending.set(id, { resolve, reject, onProgress });
        this.worker.postMessage({ type: 'call', id, op, args }, transfer || []);
      }));
    }
    get busy() { return this.pending.size > 0; }
  }

  // The engine instances: the primary answers every call and keeps the last
  // analysis (exports, plots); with several series, an analysis is spread
  // over it and up to maxWorkers - 1 helpers, each a worker with its own
  // instance of the same compiled module (started on first use).
  const maxWorkers = Math.max(1, Math.min(8, navigator.hardwareConcurrency || 2));
  let engine = null;
  const helpers = [];
  const enginePromise = loadWasm().then((wasm) => {
    engine = new Engine(wasm);
    return engine.ready;
  });
  function enginesFor(n) {
    while (helpers.length < n - 1) helpers.push(new Engine(engine.wasm));
    return [engine, ...helpers.slice(0, n - 1)];
  }
  function cancelAll() {
    if (engine) engine.cancel();
    for (const h of helpers) if (h.busy) h.cancel();
  }

  const toBytes = (data) => {
    if (typeof data === 'string') return new TextEncoder().encode(data);
    if (data instanceof ArrayBuffer) return new Uint8Array(data.slice(0));
    if (ArrayBuffer.isView(data)) return new Uint8Array(data.buffer.slice(data.byteOffset, data.byteOffset + data.byteLength));
    throw new EngineError('usage', 'data must be text, an ArrayBuffer or a Uint8Array');
  };
  const settingsText = (s) => {
    if (s === undefined || s === null) return '';
    if (typeof s === 'string') return s;
    return JSON.stringify(s);
  };

  async function engineCall(op, args, onProgress) {
    await enginePromise;
    const transfer = args && args.bytes ? [args.bytes.buffer] : [];
    return engine.call(op, args, onProgress, transfer);
  }

  // analyze runs one analysis. With more than one series and more than one
  // worker allowed (options.workers, default maxWorkers), the primary plans
  // it (counts the series), the series are handed out in chunks to the
  // engine instances as each becomes free, and the primary assembles the
  // parts by series index: the document is the one a single instance gives
  // (every replication is seeded by its own index, never by the worker).
  // options.confirm(plan, workers), if given, receives the plan with the
  // pilot's estimate before any work and returns (a promise of) whether to
  // go on. onProgress receives the engine's progress; in a spread run each
  // report also carries overall (0..1, never going back) and workers.
  // A cancelled spread run rejects with an error whose partial() resolves
  // to the document of the series done so far (the others marked).
  async function analyze(data, settings, name, onProgress, options) {
    await enginePromise;
    const o = options || {};
    const bytes = toBytes(data);
    const st = settingsText(settings);
    const nm = name || 'pasted';
    const want = Math.max(1, Math.min(maxWorkers, Math.floor(Number(o.workers)) || maxWorkers));
    const single = () => engine.call('analyze', { name: nm, bytes, settings: st }, onProgress, [bytes.buffer]);
    if (want === 1 && !o.confirm) return single();
    const plan = await engine.call('plan', { name: nm, bytes: bytes.slice(), settings: st, pilot: !!o.confirm });
    // Units of work: series, or each picked test on each series (bridge.Units).
    const n = plan.series, m = plan.units, total = n * m;
    const engines = total > 1 ? enginesFor(Math.min(want, total)) : [engine];
    if (o.confirm && !(await o.confirm(plan, engines.length))) throw new EngineError('declined', 'not started');
    if (engines.length === 1) return single();
    const parts = plan.first ? plan.first.slice() : [];
    const queue = [];
    const chunk = Math.max(1, Math.floor(total / (8 * engines.length)));
    for (let u = parts.length; u < total; u += chunk) {
      const units = [];
      for (let v = u; v < Math.min(total, u + chunk); v++) units.push(v);
      queue.push(units);
    }
    const unitsDone = new Array(n).fill(0);
    let done = parts.length, seriesDone = 0, overall = 0;
    for (const p of parts) if (++unitsDone[p.index] === m) seriesDone++;
    const within = engines.map(() => 0);
    const current = engines.map(() => ({ units: [], pos: 0 }));
    const report = (p, k) => {
      let finished = false; // a whole series is done
      if (p.stage === 'series') {
        const u = current[k].units[current[k].pos++];
        done++;
        within[k] = 0;
        if (u !== undefined && ++unitsDone[Math.floor(u / m)] === m) { seriesDone++; finished = true; }
      } else if (p.stage === 'simulation' && p.total) within[k] = Math.max(within[k], Math.min(0.95, p.done / p.total));
      overall = Math.max(overall, Math.min(1, (done + within.reduce((a, b) => a + b, 0)) / total));
      if (onProgress) {
        const q = Object.assign({}, p, { overall, workers: engines.length });
        // Stage "series" counts finished series; one test done on a series
        // whose other tests still run is reported as stage "test".
        if (p.stage === 'series') Object.assign(q, { stage: finished ? 'series' : 'test', done: seriesDone, total: n });
        onProgress(q);
      }
    };
    const work = async (e, k) => {
      while (queue.length) {
        const units = queue.shift();
        current[k] = { units, pos: 0 };
        const copy = bytes.slice();
        const got = await e.call('part', { name: nm, bytes: copy, settings: st, units }, (p) => report(p, k), [copy.buffer]);
        parts.push(...got);
      }
    };
    try {
      await Promise.all(engines.map(work));
    } catch (err) {
      queue.length = 0;
      for (const e of engines) if (e.busy) e.cancel();
      if (err.kind === 'cancelled' && parts.length) {
        err.done = seriesDone;
        err.total = n;
        err.partial = () => engine.call('assemble', { name: nm, bytes: bytes.slice(), settings: st, parts: parts.slice(), partial: true });
      }
      throw err;
    }
    parts.sort((a, b) => a.index - b.index || a.test - b.test);
    return engine.call('assemble', { name: nm, bytes, settings: st, parts, partial: false }, null, [bytes.buffer]);
  }

  // ---------- automation API ----------

  const VERSION = '{{VERSION}}';
  const api = {
    version: () => VERSION,
    ready: enginePromise.then(() => { timings.ready = performance.now() - t0; return VERSION; }),
    timings,
    workers: maxWorkers,
    analyze: (data, settings, name, onProgress, options) => analyze(data, settings, name, onProgress, options),
    inspect: (data, settings, name) =>
      engineCall('inspect', { name: name || 'pasted', bytes: toBytes(data), settings: settingsText(settings) }),
    exportReport: (format) => engineCall('export', { format: String(format) }),
    plots: (index) => engineCall('plots', { index: Number(index) }),
    bench: (n) => engineCall('bench', { n: Number(n) }).then((r) => r.ms),
    about: () => engineCall('about', {}),
    cancel: cancelAll,
  };
  Object.freeze(api);
  Object.defineProperty(window, 'rootshift', { value: api, enumerable: true });

  // ---------- page state ----------

  // long: the long-table reading the user confirmed (settings.long), null for a wide table.
  const state = { name: '', bytes: null, about: null, preview: null, running: false, lastDoc: null, long: null };

  const status = (msg, isError) => {
    const el = $('status');
    el.textContent = msg;
    el.classList.toggle('error', !!isError);
  };

  function el(tag, attrs, ...children) {
    const e = document.createElement(tag);
    if (attrs) {
      for (const [k, v] of Object.entries(attrs)) {
        if (v === undefined || v === null || v === false) continue;
        if (k === 'class') e.className = v;
        else if (k === 'text') e.textContent = v;
        else e.setAttribute(k, v === true ? '' : v);
      }
    }
    for (const c of children) {
      if (c === null || c === undefined || c === false) continue;
      e.append(c instanceof Node ? c : String(c));
    }
    return e;
  }

  const fmt = (x, d = 3) => (x === null || x === undefined || !isFinite(x)) ? '—' : Number(x).toFixed(d);
  const fmtP = (x) => (x === null || x === undefined || !isFinite(x)) ? '—' : (x < 0.001 ? '<0.001' : Number(x).toFixed(3));

  // ---------- data input ----------

  function setData(name, bytes) {
    // Data to analyse: start the helper workers now rather than on the run.
    enginePromise.then(() => enginesFor(maxWorkers), () => {});
    state.long = null;
    state.name = name;
    state.bytes = bytes;
    refreshPreview();
  }

  async function readFile(file) {
    const buf = await file.arrayBuffer();
    $('demo-note').hidden = true;
    setData(file.name, new Uint8Array(buf));
  }

  $('file').addEventListener('change', (e) => { if (e.target.files[0]) readFile(e.target.files[0]); });
  const drop = $('drop');
  drop.addEventListener('dragover', (e) => { e.preventDefault(); drop.classList.add('over'); });
  drop.addEventListener('dragleave', () => drop.classList.remove('over'));
  drop.addEventListener('drop', (e) => {
    e.preventDefault();
    drop.classList.remove('over');
    const f = e.dataTransfer.files[0];
    if (f) readFile(f);
  });
  $('use-paste').addEventListener('click', () => {
    const text = $('paste').value;
    if (!text.trim()) { status('Paste some cells first (header row first).', true); return; }
    $('demo-note').hidden = true;
    setData('pasted', new TextEncoder().encode(text));
  });
  $('use-demo').addEventListener('click', async () => {
    try {
      const d = await engineCall('demo', {});
      $('demo-note').textContent = d.description;
      $('demo-note').hidden = false;
      setData(d.name, new TextEncoder().encode(d.text));
    } catch (err) { status(err.message, true); }
  });

  // Settings that select the input (they change the preview) are marked
  // "input" in the engine's settings description.
  let previewTimer = 0;
  const onInputSetting = () => { clearTimeout(previewTimer); previewTimer = setTimeout(refreshPreview, 350); };

  async function refreshPreview() {
    if (!state.bytes) return;
    let s;
    try { s = readSettings(true); } catch (err) { status(err.message, true); return; }
    const box = $('preview');
    try {
      const p = await engineCall('inspect', { name: state.name, bytes: state.bytes.slice(), settings: JSON.stringify(s) });
      state.preview = p;
      renderPreview(p);
      $('run').disabled = p.series.length === 0;
      status('Ready: choose what to test, then press “Find out”.');
    } catch (err) {
      box.replaceChildren(el('p', { class: 'errors' }, 'Could not read the data: ' + err.message));
      state.preview = null;
      $('run').disabled = true;
      status('The data could not be read.', true);
    }
  }

  function renderPreview(p) {
    const box = $('preview');
    const prevChecked = new Map();
    for (const cb of box.querySelectorAll('input[data-col]')) prevChecked.set(cb.dataset.col, cb.checked);
    const facts = [
      `${p.rows} rows`,
      p.date_column ? `date column “${p.date_column}”` : 'no date column (observations are numbered)',
      p.frequency ? `frequency: ${p.frequency}` : null,
      p.first_date ? `${p.first_date} to ${p.last_date}` : null,
      `${p.series.length} series`,
    ].filter(Boolean);
    const rows = p.series.map((c) => {
      const checked = prevChecked.has(c.name) ? prevChecked.get(c.name) : true;
      const sel = p.selected.find((x) => x.name === c.name);
      let use = '—';
      if (sel) use = sel.error ? sel.error : `${sel.n} obs.` + (sel.start ? ` ${sel.start} – ${sel.end}` : '');
      return el('tr', null,
        el('td', null, el('label', { class: 'choice' },
          el('input', { type: 'checkbox', 'data-col': c.name, checked: checked ? true : null, 'aria-label': 'analyse ' + c.name }),
          el('span', null, c.name))),
        el('td', { class: 'num', 'data-label': 'Obs.' }, c.n),
        el('td', { class: 'num', 'data-label': 'Missing' }, c.missing),
        el('td', { class: 'num', 'data-label': 'Min' }, fmt(c.min, 2)),
        el('td', { class: 'num', 'data-label': 'Max' }, fmt(c.max, 2)),
        el('td', { class: sel && sel.error ? 'errors' : '', 'data-label': 'Used' }, use));
    });
    const table = el('div', { class: 'table-wrap' }, el('table', { class: 'stack' },
      el('caption', { class: 'sr-only' }, 'Series found in the data'),
      el('thead', null, el('tr', null, ...['Series', 'Obs.', 'Missing', 'Min', 'Max', 'Used in the analysis'].map((h) => el('th', { scope: 'col' }, h)))),
      el('tbody', null, ...rows)));
    const pick = (on) => { for (const cb of box.querySelectorAll('input[data-col]')) cb.checked = on; };
    const all = el('button', { type: 'button', id: 'cols-all' }, 'Select all');
    const none = el('button', { type: 'button', id: 'cols-none' }, 'Select none');
    all.addEventListener('click', () => pick(true));
    none.addEventListener('click', () => pick(false));
    const parts = [el('h3', null, 'What was read', el('span', { class: 'tag' }, p.name)), el('p', { class: 'small' }, facts.join(' · ')),
      el('div', { class: 'actions small' }, all, none)];
    // Many series: the table of series starts closed (its checkboxes still count).
    const wasOpen = box.querySelector('details.series-table');
    const many = p.series.length > 8;
    parts.push(many ? el('details', { class: 'series-table', open: wasOpen && wasOpen.open ? true : null },
      el('summary', { class: 'small' }, `The ${p.series.length} series: which to test`), table) : table);
    if (p.select_error) parts.push(el('p', { class: 'errors' }, p.select_error));
    // A long table (one row per id, date and value) is offered, never assumed.
    const colsText = (lc) => `ids in “${lc.id || 'id'}”, dates in “${lc.date || 'date'}”, values in “${lc.value || 'value'}”`;
    if (p.long_detected && !p.long) {
      const yes = el('button', { type: 'button', id: 'read-long', class: 'primary' }, 'Read it as a long table');
      yes.addEventListener('click', () => { state.long = p.long_detected; refreshPreview(); });
      parts.unshift(el('div', { class: 'long-offer', id: 'long-offer' },
        el('p', null, 'This looks like a long table, one row per series: ' + colsText(p.long_detected) + '.'), yes));
    }
    if (p.long) {
      const no = el('button', { type: 'button', id: 'read-wide' }, 'Read it as a wide table instead');
      no.addEventListener('click', () => { state.long = null; refreshPreview(); });
      parts.splice(2, 0, el('p', { class: 'small' }, 'Read as a long table: ' + colsText(p.long) + '. ', no));
    }
    if (p.warnings && p.warnings.length) parts.push(el('ul', { class: 'tight small muted' }, ...p.warnings.map((w) => el('li', null, w))));
    box.replaceChildren(...parts);
    if (p.first_date && $('s-from') && $('s-to')) {
      $('s-from').placeholder = p.first_date;
      $('s-to').placeholder = p.last_date;
    }
  }

  // ---------- settings ----------

  // The settings form is built from the engine's description
  // (battery.SettingsDescription via about.settings): labels, defaults,
  // choices and what each setting applies to are never typed here.
  const settingId = (field) => 's-' + field.replace(/_/g, '-');

  function num(id, integer, min, max) {
    const v = $(id).value.trim();
    if (v === '') return undefined;
    const x = Number(v);
    const label = document.querySelector(`label[for="${id}"]`);
    const what = label ? label.firstChild.textContent.trim() : id;
    if (!isFinite(x) || (integer && !Number.isInteger(x)) || (min !== undefined && x < min) || (max !== undefined && x > max)) {
      throw new EngineError('usage', `${what}: “${v}” is not a valid value`);
    }
    return x;
  }

  function renderSettings(desc) {
    const main = $('settings-main'), adv = $('settings-advanced');
    main.replaceChildren();
    adv.replaceChildren();
    for (const d of desc) {
      const id = settingId(d.field);
      const hint = el('span', { class: 'hint' }, 'default: ' + d.default);
      // Advanced settings show what they apply to; the main ones say it on hover.
      const applies = d.advanced ? el('span', { class: 'hint applies' }, 'applies to: ' + d.applies_to) : null;
      let field;
      if (d.kind === 'flag') {
        field = el('div', { class: 'field', 'data-setting': d.field },
          el('label', { class: 'choice', for: id }, el('input', { type: 'checkbox', id }), el('span', null, d.label)), applies);
      } else {
        let control;
        if (d.kind === 'choice') {
          control = el('select', { id }, ...d.choices.map((c) => el('option', { value: c.value }, c.label)));
        } else if (d.kind === 'integer' || d.kind === 'number') {
          control = el('input', { type: 'number', id, min: d.min, max: d.max, step: d.kind === 'integer' ? '1' : 'any' });
        } else {
          control = el('input', { type: 'text', id, autocomplete: 'off' });
        }
        field = el('div', { class: 'field', 'data-setting': d.field, title: d.advanced ? null : 'applies to: ' + d.applies_to }, el('label', { for: id }, d.label + ' ', hint), control, applies);
      }
      (d.advanced ? adv : main).append(field);
      if (d.input) $(id).addEventListener('input', onInputSetting);
    }
  }

  const txt = (id) => $(id).value.trim() || undefined;

  // readSettings returns the settings object with exactly the JSON names of
  // the command-line tool's settings (schema v2); unset fields are omitted.
  function readSettings(inputOnly) {
    const s = {};
    if (state.long) s.long = state.long;
    const put = (k, v) => { if (v !== undefined && v !== '' && v !== false && !(v === 0 && k !== 'lags' && k !== 'max_lags' && k !== 'bandwidth')) s[k] = v; };
    const desc = (state.about && state.about.settings) || [];
    for (const d of desc) {
      if (inputOnly && !d.input) continue;
      const id = settingId(d.field);
      if (!$(id)) continue;
      if (d.kind === 'flag') put(d.field, $(id).checked);
      else if (d.kind === 'choice') put(d.field, $(id).value === '' ? undefined : (d.numeric ? Number($(id).value) : $(id).value));
      else if (d.kind === 'integer' || d.kind === 'number') put(d.field, num(id, d.kind === 'integer', d.min, d.max));
      else put(d.field, txt(id));
    }
    if (inputOnly) return s;
    const cols = [...document.querySelectorAll('#preview input[data-col]')];
    if (cols.length && cols.some((c) => !c.checked)) {
      const picked = cols.filter((c) => c.checked).map((c) => c.dataset.col);
      if (!picked.length) throw new EngineError('usage', 'Pick at least one series.');
      s.columns = picked;
    }
    if ($('s-mode-pick').checked) {
      const tests = [...document.querySelectorAll('#tests-grid input:checked')].map((c) => c.value);
      if (!tests.length) throw new EngineError('usage', 'Pick at least one test, or use the recommended set.');
      s.tests = tests;
    }
    return s;
  }

  for (const r of document.querySelectorAll('input[name="s-mode"]')) {
    r.addEventListener('change', () => { $('tests-grid').hidden = !$('s-mode-pick').checked; });
  }

  function renderTests(about) {
    const grid = $('tests-grid');
    grid.replaceChildren(...about.tests.map((t) => el('label', { class: 'choice', title: t.citation },
      el('input', { type: 'checkbox', value: t.id, checked: t.verdict ? true : null }),
      el('span', null, t.name, el('span', { class: 'tag' }, t.id)))));
    $('battery-list').textContent = '(' + about.verdict_tests.join(', ') + ')';
    $('caution').textContent = about.caution;
  }

  // ---------- running ----------

  function progressText(p) {
    if (p.stage === 'simulation' && p.total) return `${p.series}, ${p.test}: replications ${p.done} of ${p.total}`;
    if (p.stage === 'test') return `Running ${p.test} on ${p.series}…`;
    if (p.stage === 'series' && p.total) return `${p.done} of ${p.total} series done`;
    return 'Working…';
  }

  $('run').addEventListener('click', run);
  $('cancel').addEventListener('click', () => {
    cancelAll();
    status('Cancelled. The engine was restarted; your data and settings are kept.');
  });

  // Long work is announced: a run estimated (by the engine's pilot, see
  // bridge.Plan) above a minute waits for the user to confirm it.
  const longRun = 60; // seconds
  const duration = (secs) => {
    if (secs < 90) return Math.round(secs) + ' s';
    const m = Math.round(secs / 60);
    if (m < 90) return m + ' min';
    const h = Math.floor(m / 60);
    return h + ' h' + (m % 60 ? ' ' + (m % 60) + ' min' : '');
  };
  function confirmLong(plan, workers, settings) {
    const per = plan.per_series_ms || [];
    const secs = Math.max(plan.estimate_ms / workers, ...per.map((x) => x / plan.units)) / 1000;
    $('confirm-box').dataset.estimate = String(secs);
    if (!(secs > longRun)) { status('Analysing…'); return true; }
    const what = [plan.series === 1 ? '1 series' : plan.series + ' series', `up to ${Math.max(0, ...plan.lengths)} observations`];
    if (settings.sims) what.push(`${settings.sims.toLocaleString('en')} replications`);
    $('confirm-text').textContent = `This analysis (${what.join(', ')}) will take about ${duration(secs)} ` +
      `on this computer with ${workers} ${workers === 1 ? 'worker' : 'parallel workers'} (estimated from a short trial run). ` +
      'Fewer replications, series or tests make it shorter. Start it?';
    $('progress-box').hidden = true;
    $('cancel').hidden = true;
    const box = $('confirm-box');
    box.hidden = false;
    status('Waiting for your answer.');
    $('confirm-run').focus();
    return new Promise((resolve) => {
      const answer = (yes) => {
        box.hidden = true;
        $('confirm-run').onclick = $('confirm-stop').onclick = null;
        if (yes) { $('progress-box').hidden = false; $('cancel').hidden = false; status('Analysing…'); }
        resolve(yes);
      };
      $('confirm-run').onclick = () => answer(true);
      $('confirm-stop').onclick = () => answer(false);
    });
  }

  async function run() {
    if (!state.bytes || state.running) return;
    let s;
    try { s = readSettings(false); } catch (err) { status(err.message, true); return; }
    state.running = true;
    $('run').disabled = true;
    $('cancel').hidden = false;
    $('progress-box').hidden = false;
    $('progress').removeAttribute('value');
    $('progress-text').textContent = 'Working…';
    status('Analysing…');
    const started = performance.now();
    // One overall progress: series k of n, the test running, its
    // replications, and the time left from the pace so far. The bar never
    // goes back; within a series it moves with the simulation of the first
    // simulated test and stops short of the series' end until it is done.
    const picked = s.columns ? s.columns.length : (state.preview ? state.preview.series.length : 0);
    const ov = { n: Math.max(1, picked), done: 0, within: 0, frac: 0 };
    $('progress-text').textContent = `Series 1 of ${ov.n}…`;
    status('Estimating the time…');
    try {
      const doc = await analyze(state.bytes.slice(), s, state.name, (p) => {
        if (p.overall !== undefined) {
          // Several workers: the aggregate of every worker's progress.
          if (p.stage === 'series') { ov.done = p.done; ov.n = Math.max(ov.n, p.total); }
          ov.frac = Math.max(ov.frac, p.overall);
        } else {
          if (p.stage === 'series') { ov.done++; ov.within = 0; ov.n = Math.max(ov.n, ov.done); }
          else if (p.stage === 'simulation' && p.total) ov.within = Math.max(ov.within, Math.min(0.95, p.done / p.total));
          ov.frac = Math.max(ov.frac, Math.min(1, (ov.done + ov.within) / ov.n));
        }
        $('progress').value = Math.floor(100 * ov.frac);
        const secs = (performance.now() - started) / 1000;
        const left = ov.frac > 0.02 && ov.frac < 1 ? ` · about ${duration(secs * (1 - ov.frac) / ov.frac)} left` : '';
        const head = p.workers > 1 ? `${ov.done} of ${ov.n} series done (${p.workers} workers)` : `Series ${Math.min(ov.done + 1, ov.n)} of ${ov.n}`;
        $('progress-text').textContent = head + (p.stage === 'series' ? '' : ': ' + progressText(p)) + left;
        $('progress').dataset.overall = String(ov.frac);
      }, { confirm: (plan, workers) => confirmLong(plan, workers, s) });
      state.lastDoc = doc;
      await renderFindings(doc);
      status(`Done in ${((performance.now() - started) / 1000).toFixed(1)} s.`);
      $('findings-h').focus({ preventScroll: true });
      $('findings-h').scrollIntoView({ block: 'start' });
    } catch (err) {
      if (err.kind === 'cancelled' && err.partial) {
        // What finished is kept: the series done so far, the others marked.
        try {
          const doc = await err.partial();
          state.lastDoc = doc;
          await renderFindings(doc);
          status(`Cancelled: ${err.done} of ${err.total} series were done and are shown; the others are marked as not analysed.`);
        } catch (e2) { status('Cancelled. The engine was restarted; your data and settings are kept.'); }
      } else if (err.kind === 'cancelled') status('Cancelled. The engine was restarted; your data and settings are kept.');
      else if (err.kind === 'declined') status('Not started. Fewer replications, series or tests make the analysis shorter.');
      else status((err.kind === 'usage' ? 'Settings: ' : '') + err.message, true);
    } finally {
      state.running = false;
      $('run').disabled = !state.bytes;
      $('cancel').hidden = true;
      $('progress-box').hidden = true;
    }
  }

  // ---------- findings ----------

  const classWords = {
    'stationary': 'Stationary',
    'trend-stationary': 'Stationary around a trend',
    'break-stationary': 'Stationary around a break',
    'unit-root': 'Unit root',
    'unit-root-breaks': 'Unit root, with breaks',
    'explosive': 'Explosive episode',
    'inconclusive': 'Inconclusive',
  };
  const transformWords = {
    'none': 'use it as it is',
    'detrend': 'remove a trend',
    'shift-dummies': 'model the breaks with shift dummies',
    'difference': 'take first differences',
    'log-difference': 'take differences of logarithms',
    'second-difference': 'take second differences',
  };

  function testName(id) {
    const t = state.about && state.about.tests.find((x) => x.id === id);
    return t ? t.name : id;
  }

  function breaksText(bs) {
    if (!bs || !bs.length) return '—';
    return bs.map((b) => (b.date || ('obs. ' + b.index)) + (b.lower ? ` [${b.lower_date || b.lower}–${b.upper_date || b.upper}]` : '')).join(', ');
  }

  function decisionText(r) {
    // One decimal where the level has one (the explosive stage's 2.5%).
    const lv = r.level ? Math.round(r.level * 1000) / 10 + '%' : '';
    return (r.reject ? 'rejects H0' : 'does not reject H0') + ' at ' + lv;
  }

  function resultRows(r) {
    const cv = r.critical_values || {};
    const rows = [el('tr', null,
      el('th', { scope: 'row', 'data-label': 'Test' }, testName(r.test), el('span', { class: 'tag' }, [r.test, r.trend, r.variant].filter(Boolean).join(' · ')), el('span', { class: 'h0' }, 'H0: ' + r.null)),
      el('td', { class: 'num', 'data-label': 'Statistic' }, fmt(r.statistic)),
      el('td', { class: 'num', title: r.p_value_method, 'data-label': 'p-value' }, fmtP(r.p_value) + (r.p_value_sim !== undefined && r.p_value_sim !== null ? ` (sim. ${fmtP(r.p_value_sim)})` : '')),
      el('td', { class: 'num', 'data-label': '1%' }, fmt(cv['0.01'])),
      el('td', { class: 'num', 'data-label': '5%' }, fmt(cv['0.05'])),
      el('td', { class: 'num', 'data-label': '10%' }, fmt(cv['0.10'])),
      el('td', { class: 'num', 'data-label': 'Lags' }, r.lags + (r.lag_rule ? ' ' + r.lag_rule : '')),
      el('td', { 'data-label': 'Break dates' }, breaksText(r.breaks)),
      el('td', { class: 'decision', 'data-label': 'Decision' }, decisionText(r)))];
    for (const c of [...(r.components || []), ...(r.break_tests || [])]) {
      const ccv = c.critical_values || {};
      rows.push(el('tr', { class: 'small' },
        el('td', { 'data-label': 'Part' }, '↳ ' + c.name),
        el('td', { class: 'num', 'data-label': 'Statistic' }, fmt(c.statistic)),
        el('td', { class: 'num', 'data-label': 'p-value' }, fmtP(c.p_value)),
        el('td', { class: 'num', 'data-label': '1%' }, fmt(ccv['0.01'])),
        el('td', { class: 'num', 'data-label': '5%' }, fmt(ccv['0.05'])),
        el('td', { class: 'num', 'data-label': '10%' }, fmt(ccv['0.10'])),
        el('td', { class: 'empty' }, ''), el('td', { class: 'empty' }, ''),
        el('td', { class: 'decision', 'data-label': 'Decision' }, c.reject ? 'rejects' : 'does not reject')));
    }
    return rows;
  }

  function noteText(n) {
    const at = [n.row ? 'line ' + n.row : null, n.column ? 'column "' + n.column + '"' : null].filter(Boolean).join(', ');
    return (at ? at + ': ' : '') + n.message;
  }

  const pct = (x) => (x === null || x === undefined || !isFinite(x)) ? '—' : (100 * x < 1 && x > 0 ? '<1%' : Math.round(100 * x) + '%');

  // overviewRow is one series in the overview table: what the verdict says,
  // in one line, with a link to the series' detail below.
  function overviewRow(sr, i) {
    const v = sr.verdict;
    const cls = v ? v.class : '';
    const link = el('a', { href: '#series-' + i, 'data-open': String(i) }, sr.name);
    const rel = v && v.reliability;
    let win = '—';
    if (v && v.window) win = v.window.answer || (v.window.break_inside ? 'a break inside' : 'no break inside');
    const tr = el('tr', { 'data-class': cls, 'data-row': String(i) },
      el('th', { scope: 'row', 'data-label': 'Series' }, link),
      el('td', { 'data-label': 'Verdict', class: v ? 'vclass v-' + cls : '' }, v ? (classWords[cls] || cls) : (sr.errors && sr.errors.length ? 'failed' : 'no verdict (tests picked)')),
      el('td', { 'data-label': 'Order' }, v && v.order !== null && v.order !== undefined ? 'I(' + v.order + ')' : '—'),
      el('td', { 'data-label': 'What to do', title: v ? (transformWords[v.transform] || v.transform) : null }, v ? v.transform : '—'),
      el('td', { 'data-label': 'Breaks', class: 'wrap' }, ...(v && v.breaks && v.breaks.length ? v.breaks.map((b) => el('span', { class: 'date' }, b.date || ('obs. ' + b.index))) : ['—'])),
      el('td', { 'data-label': 'Window' }, win),
      el('td', { class: 'num', 'data-label': 'Error rate', title: rel ? rel.headline : '' }, rel ? pct(rel.wrong_rate) + (rel.t ? ` at T=${rel.t}` : '') : '—'));
    // Empty cells are left out of the phone layout.
    for (const c of tr.querySelectorAll('td')) if (c.textContent === '—') c.classList.add('none');
    return tr;
  }

  function applyFilter() {
    const want = $('class-filter') ? $('class-filter').value : '';
    for (const tr of document.querySelectorAll('#overview tbody tr')) tr.hidden = !!want && tr.dataset.class !== want;
    for (const a of document.querySelectorAll('#results article[data-class]')) a.hidden = !!want && a.dataset.class !== want;
  }

  async function loadPlots(card, i) {
    if (card.dataset.plots) return;
    card.dataset.plots = 'loading';
    try {
      const plots = await engineCall('plots', { index: i });
      const figs = card.querySelector('.plots');
      for (const p of plots) {
        const f = el('figure', null);
        const holder = el('div', null);
        // The SVG text is produced by our own Go code, which escapes every label.
        holder.innerHTML = p.svg;
        f.append(holder, el('figcaption', null, p.title));
        figs.append(f);
      }
      card.dataset.plots = 'done';
    } catch (err) {
      delete card.dataset.plots;
    }
  }

  async function renderFindings(doc) {
    $('findings-h').hidden = false;
    $('findings-h').tabIndex = -1;
    $('exports').hidden = false;
    const out = $('results');
    out.replaceChildren();
    const n = doc.series.length;
    const collapsed = n > 3;
    // The overview first: one row per series.
    const classes = [...new Set(doc.series.map((sr) => sr.verdict && sr.verdict.class).filter(Boolean))];
    const filter = el('select', { id: 'class-filter' }, el('option', { value: '' }, `every class (${n})`),
      ...classes.map((c) => el('option', { value: c }, `${classWords[c] || c} (${doc.series.filter((sr) => sr.verdict && sr.verdict.class === c).length})`)));
    filter.addEventListener('change', applyFilter);
    const expandAll = el('button', { type: 'button', id: 'expand-all' }, 'Open every detail');
    const collapseAll = el('button', { type: 'button', id: 'collapse-all' }, 'Close every detail');
    expandAll.addEventListener('click', () => { for (const d of out.querySelectorAll('article details')) d.open = true; });
    collapseAll.addEventListener('click', () => { for (const d of out.querySelectorAll('article details')) d.open = false; });
    out.append(el('div', { class: 'card', id: 'overview' },
      el('div', { class: 'overview-head' }, el('h3', null, 'Overview'),
        el('label', { for: 'class-filter', class: 'small' }, 'Show ', filter),
        n > 1 ? expandAll : null, n > 1 ? collapseAll : null),
      el('table', { class: 'stack overview' },
        el('caption', { class: 'sr-only' }, 'One row per series'),
        el('thead', null, el('tr', null, ...['Series', 'Verdict', 'Order', 'What to do', 'Breaks', 'Window', 'Error rate'].map((h) => el('th', { scope: 'col' }, h)))),
        el('tbody', null, ...doc.series.map(overviewRow)))));
    // Notes on the input: everything the reader decided or changed.
    const srcNotes = (doc.source && doc.source.notes) || [];
    const sourceNotes = new Set(srcNotes.map((x) => x.kind + '\u0000' + x.message));
    if (srcNotes.length) {
      out.append(el('details', { class: 'card notes' }, el('summary', { class: 'small' }, el('strong', null, `Notes on the input (${srcNotes.length})`)),
        el('ul', { class: 'tight small muted' }, ...srcNotes.map((x) => el('li', null, noteText(x))))));
    }
    const list = el('div', { class: 'series-list' + (collapsed ? ' many' : '') });
    out.append(list);
    for (let i = 0; i < n; i++) {
      const sr = doc.series[i];
      const v = sr.verdict;
      const card = el('article', { class: 'card series', id: 'series-' + i, 'aria-labelledby': 'series-h-' + i, 'data-series': sr.name, 'data-class': v ? v.class : '' });
      const det = el('details', { open: collapsed ? null : true });
      const meta = [`${sr.n} observations`, sr.start ? `${sr.start} – ${sr.end}` : null, sr.frequency, sr.transform ? `transform: ${sr.transform}` : null].filter(Boolean).join(' · ');
      det.append(el('summary', null, el('h3', { id: 'series-h-' + i }, sr.name),
        v ? el('span', { class: 'tag' }, classWords[v.class] || v.class) : null), el('p', { class: 'small muted' }, meta));
      if (v) {
        const box = el('div', { class: 'verdict v-' + v.class, 'data-verdict': v.class },
          el('div', { class: 'class' }, classWords[v.class] || v.class,
            v.order !== null && v.order !== undefined ? el('span', { class: 'tag' }, 'I(' + v.order + ')') : null,
            v.drift ? el('span', { class: 'tag' }, 'with drift') : null),
          el('p', null, v.explanation),
          el('p', { class: 'small' }, el('strong', null, 'What to do: '), transformWords[v.transform] || v.transform,
            v.breaks && v.breaks.length ? '. Breaks: ' + breaksText(v.breaks) : ''));
        if (v.reliability && v.reliability.headline) box.append(el('p', { class: 'small' }, v.reliability.headline));
        if (v.window) {
          box.append(el('p', { class: 'small' }, `Suspected window ${v.window.from} – ${v.window.to}: ` +
            (v.window.answer || (v.window.break_inside ? 'the break-aware test restricted to the window rejects a unit root.' : 'the break-aware test restricted to the window does not reject a unit root.'))));
        }
        if (v.supporting && v.supporting.length) box.append(el('p', { class: 'small' }, el('strong', null, 'Evidence for: ')), el('ul', { class: 'tight small' }, ...v.supporting.map((x) => el('li', null, x))));
        if (v.against && v.against.length) box.append(el('p', { class: 'small' }, el('strong', null, 'Evidence against: ')), el('ul', { class: 'tight small' }, ...v.against.map((x) => el('li', null, x))));
        det.append(box);
      }
      if (sr.errors && sr.errors.length) {
        det.append(el('ul', { class: 'tight errors small' }, ...sr.errors.map((e) => el('li', null, (e.test ? e.test + ': ' : '') + e.message))));
      }
      if (sr.warnings && sr.warnings.length) {
        det.append(el('ul', { class: 'tight small muted' }, ...sr.warnings.map((w) => el('li', null, w))));
      }
      // The reader's notes on this series that the input notes above do not already hold.
      const own = (sr.notes || []).filter((x) => !sourceNotes.has(x.kind + '\u0000' + x.message));
      if (own.length) {
        det.append(el('ul', { class: 'tight small muted notes' }, ...own.map((x) => el('li', null, noteText(x)))));
      }
      if (sr.results.length) {
        det.append(el('div', { class: 'table-wrap' }, el('table', { class: 'results stack' },
          el('caption', { class: 'sr-only' }, 'Test results for ' + sr.name),
          el('thead', null, el('tr', null, ...['Test', 'Statistic', 'p-value', '1%', '5%', '10%', 'Lags', 'Break dates', 'Decision'].map((h) => el('th', { scope: 'col' }, h)))),
          el('tbody', null, ...sr.results.flatMap(resultRows)))));
      }
      det.append(el('div', { class: 'plots' }));
      card.append(det);
      list.append(card);
      // Plots are drawn by the engine (report.SeriesSVG, PathSVG, ACFSVG) when the detail is first opened.
      det.addEventListener('toggle', () => { if (det.open) loadPlots(card, i); });
    }
    for (const a of out.querySelectorAll('a[data-open]')) {
      a.addEventListener('click', () => { const d = $('series-' + a.dataset.open).querySelector('details'); d.open = true; });
    }
    applyFilter();
    if (!collapsed) {
      const cards = out.querySelectorAll('article');
      for (let i = 0; i < cards.length; i++) await loadPlots(cards[i], i);
    }
  }

  async function download(format) {
    try {
      const x = await engineCall('export', { format });
      const url = URL.createObjectURL(new Blob([x.text], { type: x.mime + ';charset=utf-8' }));
      const a = el('a', { href: url, download: x.file_name });
      document.body.append(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 10000);
      status(`Saved ${x.file_name}.`);
    } catch (err) { status(err.message, true); }
  }
  for (const b of document.querySelectorAll('[data-export]')) {
    b.addEventListener('click', () => download(b.dataset.export));
  }

  // ---------- start ----------

  api.ready.then(async () => {
    try {
      state.about = await engineCall('about', {});
      renderTests(state.about);
      renderSettings(state.about.settings || []);
    } catch (err) { /* the test list is optional */ }
    status(state.bytes ? 'Ready.' : 'Ready. Start with your data, or try the demo data.');
    $('run').disabled = !state.bytes;
    document.documentElement.dataset.ready = 'true';
  }, (err) => status('The engine could not start: ' + err.message, true));
})();
