// tonewright live: the page. It draws what the server computes and sends
// every change back; no figure is computed here.
'use strict';

(function () {
  const token = document.querySelector('meta[name="tw-token"]').content;
  const $ = (id) => document.getElementById(id);

  // Curve colours: the knob's low end warm, its high end cool, the current
  // setting dark, the saved design grey and dashed, the compared design
  // amber.
  const colours = {
    current: '#1f2a44',
    low: 'rgba(176, 58, 46, 0.38)',
    high: 'rgba(32, 112, 170, 0.38)',
    saved: '#8a867c',
    compare: '#d08a12',
  };

  const st = {
    info: null,       // /api/state
    setting: {},      // knob name -> 0..1
    values: {},       // part name -> accepted text
    sweep: '',        // knob drawn at its ends
    last: null,       // last /api/eval answer drawn
    seq: 0,           // requests sent
    drawnSeq: 0,      // newest request drawn
    inFlight: false,  // a slider's request is out
    busy: 0,          // requests out of any kind
    queued: false,
    inputT0: 0,       // performance.now() of the earliest input not yet drawn
    latencies: [],    // ms from input event to redrawn curve
    draws: 0,
    hoverX: null,     // pointer over the plot, CSS pixels from its left
  };
  window.tw = st; // for the browser tests

  function setStatus(msg, kind) {
    const s = $('status');
    s.textContent = msg;
    s.className = 'status' + (kind ? ' ' + kind : '');
  }

  async function post(path, body) {
    st.busy++;
    try {
      const r = await fetch(path, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', 'X-Tonewright-Token': token },
        body: JSON.stringify(body),
      });
      if (r.headers.get('Content-Type') === 'audio/wav') {
        return { ok: r.ok, status: r.status, blob: await r.blob() };
      }
      let data = null;
      try { data = await r.json(); } catch (e) { data = { error: 'unreadable answer (' + r.status + ')' }; }
      return { ok: r.ok, status: r.status, data };
    } catch (e) {
      return { ok: false, status: 0, data: { error: 'the server does not answer: is tonewright live still running? (' + e + ')' } };
    } finally {
      st.busy--;
    }
  }

  // ---- number formatting (display only) ----
  const prefixes = [[1e9, 'G'], [1e6, 'M'], [1e3, 'k'], [1, ''], [1e-3, 'm'], [1e-6, 'µ'], [1e-9, 'n'], [1e-12, 'p']];
  function eng(v, unit) {
    if (v === null || v === undefined || !isFinite(v)) return '—';
    if (v === 0) return '0 ' + unit;
    const a = Math.abs(v);
    for (const [m, p] of prefixes) {
      if (a >= m * 0.9995) {
        let x = v / m;
        let s = Math.abs(x) >= 100 ? x.toFixed(0) : Math.abs(x) >= 10 ? x.toFixed(1) : x.toFixed(2);
        return s + ' ' + p + unit;
      }
    }
    return v.toExponential(2) + ' ' + unit;
  }
  const minus = (s) => s.replace(/^-/, '−');
  function dB(v, plus) {
    if (v === null || v === undefined || !isFinite(v)) return '—';
    const s = v.toFixed(2);
    return minus(plus && v > 0 ? '+' + s : s === '-0.00' ? '0.00' : s) + ' dB';
  }

  function percent(r) {
    if (Math.abs(r) < 0.0005) return '';
    const s = (100 * r).toFixed(Math.abs(r) < 0.1 ? 1 : 0);
    return minus(r > 0 ? '+' + s : s) + ' %';
  }

  // ---- controls ----
  function buildKnobs() {
    const box = $('knobs');
    box.textContent = '';
    for (const k of st.info.knobs) {
      st.setting[k.name] = k.saved;
      const row = document.createElement('div');
      row.className = 'knob';
      const label = document.createElement('label');
      label.htmlFor = 'knob-' + k.name;
      label.textContent = k.label;
      const input = document.createElement('input');
      input.type = 'range'; input.min = '0'; input.max = '1'; input.step = '0.01';
      input.id = 'knob-' + k.name;
      input.value = String(k.saved);
      const out = document.createElement('output');
      out.id = 'knob-' + k.name + '-value';
      out.textContent = k.saved.toFixed(2);
      input.addEventListener('input', () => {
        const t0 = performance.now();
        const v = Number(input.value);
        st.setting[k.name] = v;
        out.textContent = v.toFixed(2);
        st.sweep = k.name;
        refresh(t0);
      });
      row.append(label, input, out);
      box.append(row);
    }
    st.sweep = st.info.knobs[0].name;
  }

  const groupTitles = { tone: 'Tone network', filters: 'Filter sections', level: 'Level', surroundings: 'Source and load' };

  function buildParts() {
    const box = $('parts');
    box.textContent = '';
    let group = '';
    for (const p of st.info.parts) {
      if (p.group !== group) {
        group = p.group;
        const h = document.createElement('h3');
        h.textContent = groupTitles[group] || group;
        box.append(h);
      }
      st.values[p.name] = p.text;
      const row = document.createElement('div');
      row.className = 'part';
      row.id = 'part-' + p.name.replace(/\./g, '-');
      const label = document.createElement('label');
      label.htmlFor = row.id + '-value';
      label.textContent = p.role;
      const small = document.createElement('small');
      small.textContent = p.name;
      label.append(small);
      const input = document.createElement('input');
      input.id = row.id + '-value';
      input.value = p.text;
      input.spellcheck = false;
      input.autocomplete = 'off';
      input.title = p.zero ? '0 means ' + p.zero : p.open ? 'a value, or open' : '';
      const down = document.createElement('button');
      down.type = 'button'; down.textContent = '▼'; down.title = 'next value down the series';
      const up = document.createElement('button');
      up.type = 'button'; up.textContent = '▲'; up.title = 'next value up the series';
      const unit = document.createElement('span');
      unit.className = 'unit'; unit.textContent = p.unit;
      const msg = document.createElement('div');
      msg.className = 'msg'; msg.id = row.id + '-msg';
      input.addEventListener('change', () => editPart(p, input, msg));
      input.addEventListener('keydown', (e) => {
        if (e.key === 'ArrowUp' || e.key === 'ArrowDown') {
          e.preventDefault();
          stepPart(p, input, msg, e.key === 'ArrowUp' ? 1 : -1);
        }
      });
      down.addEventListener('click', () => stepPart(p, input, msg, -1));
      up.addEventListener('click', () => stepPart(p, input, msg, 1));
      row.append(label, input, down, up, unit, msg);
      box.append(row);
    }
  }

  function showPartError(input, msg, text) {
    input.classList.add('invalid');
    msg.textContent = text;
    msg.classList.add('show');
  }
  function clearPartError(input, msg) {
    input.classList.remove('invalid');
    msg.textContent = '';
    msg.classList.remove('show');
  }

  // editPart tries a typed value: the server checks it with the whole
  // design; a refusal leaves everything as it was and shows why.
  async function editPart(p, input, msg) {
    const t0 = performance.now();
    const values = Object.assign({}, st.values, { [p.name]: input.value });
    const seq = ++st.seq;
    const r = await post('/api/eval', { setting: st.setting, values, sweep: st.sweep });
    if (!r.ok) {
      showPartError(input, msg, r.data.error);
      return;
    }
    clearPartError(input, msg);
    st.values[p.name] = r.data.values[p.name];
    markChanged();
    draw(r.data, seq, t0);
  }

  async function stepPart(p, input, msg, dir) {
    const r = await post('/api/step', { part: p.name, value: input.value, series: $('series').value, direction: dir });
    if (!r.ok) {
      showPartError(input, msg, r.data.error);
      return;
    }
    input.value = r.data.value;
    editPart(p, input, msg);
  }

  function markChanged() {
    const saved = st.last ? st.savedValues : null;
    for (const p of st.info.parts) {
      const input = $('part-' + p.name.replace(/\./g, '-') + '-value');
      input.classList.toggle('changed', !!saved && st.values[p.name] !== saved[p.name]);
    }
  }

  // refresh asks for the curves at the current setting; while a request
  // is out, further moves wait and are sent together when it is back.
  function refresh(t0) {
    if (!st.inputT0) st.inputT0 = t0 || performance.now();
    if (st.inFlight) { st.queued = true; return; }
    st.inFlight = true;
    const seq = ++st.seq;
    const since = st.inputT0;
    st.inputT0 = 0;
    post('/api/eval', { setting: st.setting, values: st.values, sweep: st.sweep }).then((r) => {
      st.inFlight = false;
      if (r.ok) draw(r.data, seq, since);
      else setStatus(r.data.error, 'bad');
      if (st.queued) { st.queued = false; refresh(); }
    });
  }

  // ---- drawing ----
  const canvas = $('plot');
  const ctx = canvas.getContext('2d');

  function draw(data, seq, t0) {
    if (seq < st.drawnSeq) return; // an older answer overtaken by a newer one
    st.drawnSeq = seq;
    st.last = data;
    if (!st.savedValues) st.savedValues = Object.assign({}, data.values);
    plot(data);
    figures(data);
    legend(data);
    st.draws++;
    if (t0) st.latencies.push(performance.now() - t0);
    document.body.dataset.draws = String(st.draws);
  }

  function niceFreq(f) {
    return f >= 1000 ? (f / 1000) + 'k' : String(f);
  }

  function plot(data) {
    const dpr = window.devicePixelRatio || 1;
    const w = canvas.clientWidth, h = canvas.clientHeight;
    if (canvas.width !== Math.round(w * dpr) || canvas.height !== Math.round(h * dpr)) {
      canvas.width = Math.round(w * dpr);
      canvas.height = Math.round(h * dpr);
    }
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    ctx.clearRect(0, 0, w, h);
    const m = { l: 56, r: 14, t: 12, b: 36 };
    const pw = w - m.l - m.r, ph = h - m.t - m.b;
    const hz = data.hz, c = data.curves;
    const f0 = hz[0], f1 = hz[hz.length - 1];
    const lf0 = Math.log10(f0), lspan = Math.log10(f1) - lf0;
    const x = (f) => m.l + (Math.log10(f) - lf0) / lspan * pw;

    // The dB range: the top over every curve drawn, 6 dB steps, at most
    // 60 dB deep.
    let hi = -Infinity, lo = Infinity;
    for (const key of ['current', 'low', 'high', 'saved', 'compare']) {
      const ys = c[key];
      if (!ys) continue;
      for (const v of ys) if (v !== null) { if (v > hi) hi = v; if (v < lo) lo = v; }
    }
    let top = Math.ceil((hi + 1) / 6) * 6;
    let bottom = Math.max(Math.floor((lo - 1) / 6) * 6, top - 60);
    if (!(top > bottom)) { top = 6; bottom = -54; }
    const y = (v) => m.t + (top - v) / (top - bottom) * ph;
    st.below = {}; // curves wholly below the plot, for the legend
    for (const key of ['low', 'high', 'compare']) {
      if (c[key]) st.below[key] = c[key].every((v) => v === null || v < bottom) ? bottom : null;
    }

    // Grid and labels.
    ctx.font = '12px system-ui, "DejaVu Sans", sans-serif';
    ctx.lineWidth = 1;
    ctx.strokeStyle = '#e6e2d8';
    ctx.fillStyle = '#6d6a62';
    ctx.textAlign = 'center';
    ctx.textBaseline = 'top';
    for (let d = Math.floor(lf0); d <= Math.ceil(lf0 + lspan); d++) {
      for (let k = 1; k < 10; k++) {
        const f = k * Math.pow(10, d);
        if (f < f0 * 0.9999 || f > f1 * 1.0001) continue;
        const xx = Math.round(x(f)) + 0.5;
        ctx.strokeStyle = k === 1 ? '#d4cfc3' : '#eeebe3';
        ctx.beginPath(); ctx.moveTo(xx, m.t); ctx.lineTo(xx, m.t + ph); ctx.stroke();
        if (k === 1 || k === 2 || k === 5) ctx.fillText(niceFreq(f), xx, m.t + ph + 5);
      }
    }
    ctx.textAlign = 'right';
    ctx.textBaseline = 'middle';
    const stepDB = (top - bottom) > 36 ? 12 : 6;
    for (let v = top; v >= bottom; v -= stepDB) {
      const yy = Math.round(y(v)) + 0.5;
      ctx.strokeStyle = v === 0 ? '#bdb7a9' : '#e6e2d8';
      ctx.beginPath(); ctx.moveTo(m.l, yy); ctx.lineTo(m.l + pw, yy); ctx.stroke();
      ctx.fillText(minus(String(v)), m.l - 6, yy);
    }
    ctx.save();
    ctx.translate(14, m.t + ph / 2);
    ctx.rotate(-Math.PI / 2);
    ctx.textAlign = 'center';
    ctx.fillText('gain (dB)', 0, 0);
    ctx.restore();
    ctx.textAlign = 'right';
    ctx.textBaseline = 'bottom';
    ctx.fillText('frequency (Hz)', m.l + pw, h - 2);

    // Curves: faint ends first, then the references, the current last.
    ctx.save();
    ctx.beginPath(); ctx.rect(m.l, m.t, pw, ph); ctx.clip();
    const line = (ys, colour, width, dash) => {
      if (!ys) return;
      ctx.strokeStyle = colour;
      ctx.lineWidth = width;
      ctx.setLineDash(dash || []);
      ctx.beginPath();
      let pen = false;
      for (let i = 0; i < hz.length; i++) {
        const v = ys[i];
        if (v === null) { pen = false; continue; }
        const yy = y(Math.max(v, bottom - 20));
        if (pen) ctx.lineTo(x(hz[i]), yy); else { ctx.moveTo(x(hz[i]), yy); pen = true; }
      }
      ctx.stroke();
    };
    line(c.low, colours.low, 2.5);
    line(c.high, colours.high, 2.5);
    line(c.compare, colours.compare, 2);
    line(c.saved, colours.saved, 1.8, [7, 5]);
    line(c.current, colours.current, 2.6);
    ctx.restore();
    ctx.setLineDash([]);
    ctx.strokeStyle = '#bdb7a9';
    ctx.lineWidth = 1;
    ctx.strokeRect(m.l + 0.5, m.t + 0.5, pw, ph);

    // The readout under the pointer: the frequency and the gains there.
    if (st.hoverX !== null && st.hoverX >= m.l && st.hoverX <= m.l + pw) {
      const lf = lf0 + (st.hoverX - m.l) / pw * lspan;
      let i = 0;
      for (let j = 1; j < hz.length; j++) if (Math.abs(Math.log10(hz[j]) - lf) < Math.abs(Math.log10(hz[i]) - lf)) i = j;
      const xx = Math.round(x(hz[i])) + 0.5;
      ctx.strokeStyle = '#6d6a62';
      ctx.setLineDash([2, 3]);
      ctx.beginPath(); ctx.moveTo(xx, m.t); ctx.lineTo(xx, m.t + ph); ctx.stroke();
      ctx.setLineDash([]);
      const lines = [eng(hz[i], 'Hz'), 'now ' + dB(c.current[i]), 'saved ' + dB(c.saved[i])];
      if (c.compare) lines.push('compare ' + dB(c.compare[i]));
      ctx.font = '12px system-ui, "DejaVu Sans", sans-serif';
      const bw = Math.max(...lines.map((l) => ctx.measureText(l).width)) + 14, bh = lines.length * 16 + 8;
      const bx = xx + 8 + bw > m.l + pw ? xx - 8 - bw : xx + 8;
      ctx.fillStyle = 'rgba(255, 255, 255, 0.92)';
      ctx.fillRect(bx, m.t + 6, bw, bh);
      ctx.strokeStyle = '#d4cfc3';
      ctx.strokeRect(bx + 0.5, m.t + 6.5, bw, bh);
      ctx.fillStyle = '#23211d';
      ctx.textAlign = 'left';
      ctx.textBaseline = 'top';
      lines.forEach((l, k) => ctx.fillText(l, bx + 7, m.t + 11 + 16 * k));
    }
  }

  function legend(data) {
    const box = $('legend');
    box.textContent = '';
    const item = (colour, text, dash) => {
      const s = document.createElement('span');
      const i = document.createElement('i');
      if (dash) i.className = 'dash';
      i.style.borderTopColor = colour;
      s.append(i, document.createTextNode(text));
      box.append(s);
    };
    const knob = st.info.knobs.find((k) => k.name === data.sweep);
    const name = knob ? knob.name : data.sweep;
    const below = (key) => (st.below && st.below[key] !== null && st.below[key] !== undefined)
      ? ' (below ' + minus(String(st.below[key])) + ' dB)' : '';
    item(colours.current, 'now');
    item(colours.low, name + ' at 0' + below('low'));
    item(colours.high, name + ' at 1' + below('high'));
    item(colours.saved, 'saved ' + st.info.file, true);
    if (data.curves.compare) item(colours.compare, 'compare: ' + st.info.compare + below('compare'));
  }

  const figureRows = [
    ['gain', 'gain at 1 kHz', (f) => f.gain_1k_db, dB, true],
    ['scoop-hz', 'scoop at', (f) => f.scoop && f.scoop.hz, (v) => eng(v, 'Hz'), false],
    ['scoop-depth', 'scoop depth', (f) => f.scoop && f.scoop.depth_db, dB, true],
    ['scoop-balance', 'scoop balance', (f) => f.scoop && f.scoop.balance_db, dB, true],
    ['peak-hz', 'peak at', (f) => f.peak && f.peak.hz, (v) => eng(v, 'Hz'), false],
    ['peak-rise', 'peak rise', (f) => f.peak && f.peak.rise_db, dB, true],
    ['corner', 'output corner (−3 dB)', (f) => f.corner_hz, (v) => eng(v, 'Hz'), false],
    ['low-corner', 'low corner (−3 dB)', (f) => f.low_corner_hz, (v) => eng(v, 'Hz'), false],
    ['zin', 'input impedance', (f) => f.input_impedance_ohm, (v) => eng(v, 'Ω'), false],
    ['zout', 'output impedance', (f) => f.output_impedance_ohm, (v) => eng(v, 'Ω'), false],
  ];

  function figures(data) {
    const table = $('figures');
    table.classList.toggle('with-compare', !!data.compare_figures);
    const body = table.tBodies[0];
    if (!body.rows.length) {
      for (const [id, label] of figureRows) {
        const tr = body.insertRow();
        tr.insertCell().textContent = label;
        for (const col of ['now', 'saved', 'change', 'cmp']) {
          const td = tr.insertCell();
          td.id = 'fig-' + id + '-' + col;
          td.className = col;
        }
      }
    }
    for (const [id, , get, fmt, isDB] of figureRows) {
      const now = get(data.figures), saved = get(data.saved_figures);
      $('fig-' + id + '-now').textContent = fmt(now);
      $('fig-' + id + '-saved').textContent = fmt(saved);
      let change = '';
      if (now !== null && now !== undefined && saved !== null && saved !== undefined) {
        change = isDB ? dB(now - saved, true) : percent(now / saved - 1);
        if (isDB && Math.abs(now - saved) < 0.005) change = '';
      }
      $('fig-' + id + '-change').textContent = change;
      $('fig-' + id + '-cmp').textContent = data.compare_figures ? fmt(get(data.compare_figures)) : '';
    }
  }

  // ---- play and save ----
  let audio = null;
  async function play(which) {
    setStatus('rendering the phrase…');
    const body = { setting: st.setting, values: which === 'saved' ? st.savedValues : st.values };
    const r = await post('/api/play', body);
    if (!r.ok) { setStatus(r.data.error, 'bad'); return; }
    if (audio) { audio.pause(); URL.revokeObjectURL(audio.src); }
    audio = new Audio(URL.createObjectURL(r.blob));
    audio.play().then(() => setStatus(which === 'saved' ? 'playing the saved design' : 'playing the current setting'),
      (e) => setStatus('the browser would not play: ' + e, 'bad'));
  }

  async function save() {
    $('save').disabled = true;
    const r = await post('/api/save', { setting: st.setting, values: st.values });
    $('save').disabled = false;
    if (!r.ok) { setStatus('not saved: ' + r.data.error, 'bad'); return; }
    st.savedValues = Object.assign({}, st.values);
    setStatus('saved ' + r.data.file + (r.data.backup ? ' (the previous version is kept as ' + r.data.backup + ')' : ''), 'good');
    markChanged();
    refresh();
  }

  async function start() {
    const r = await fetch('/api/state');
    st.info = await r.json();
    document.title = st.info.name + ' — tonewright live';
    $('design-name').textContent = st.info.name + ' · ' + st.info.file +
      (st.info.compare ? ' · compared with ' + st.info.compare : '');
    const sel = $('series');
    for (const s of st.info.series) {
      const o = document.createElement('option');
      o.value = o.textContent = s;
      sel.append(o);
    }
    sel.value = st.info.default_series;
    buildKnobs();
    buildParts();
    $('play').addEventListener('click', () => play('now'));
    $('play-saved').addEventListener('click', () => play('saved'));
    $('save').addEventListener('click', save);
    if (!st.info.audio) {
      for (const id of ['play', 'play-saved']) $(id).title = 'playing is not available in this build';
    }
    window.addEventListener('resize', () => { if (st.last) plot(st.last); });
    canvas.addEventListener('mousemove', (e) => {
      st.hoverX = e.clientX - canvas.getBoundingClientRect().left;
      if (st.last) plot(st.last);
    });
    canvas.addEventListener('mouseleave', () => { st.hoverX = null; if (st.last) plot(st.last); });
    refresh();
  }
  start();
})();
