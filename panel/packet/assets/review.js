"use strict";
(function () {
  const D = JSON.parse(document.getElementById("packet-data").textContent);
  const STORE = "quorate:" + D.packet;
  const CRIT = [
    ["Spiky morphology", "A di- or triphasic wave whose peak is sharp or spiky."],
    ["Duration unlike the background", "Its duration is clearly shorter or longer than that of the surrounding waves."],
    ["Asymmetry", "The waveform is asymmetric: one phase rises steeply and the other falls slowly, or the reverse."],
    ["After-going slow wave", "The transient is followed by a slow wave that belongs to it."],
    ["Background disruption", "The ongoing background is disturbed by the transient."],
    ["Cerebral field", "The distribution of negative and positive voltage over the scalp fits a source in the brain (a dipolar field, radial, oblique or tangential)."],
  ];
  const SENS = [1, 1.5, 2, 3, 5, 7, 10, 15, 20, 30, 50, 70, 100, 150, 200];
  const TB = [10, 15, 20, 25, 30, 40, 60, 120];
  const LFF = [0, 0.1, 0.3, 0.5, 1, 1.6, 3, 5];
  const HFF = [0, 15, 30, 35, 40, 50, 70, 100];
  const NOTCH = [0, 50, 60];
  const CJ = "cannot-judge";
  const $ = (id) => document.getElementById(id);
  const N = D.items.length;
  const F0 = D.filters || { low: 0, high: 0, notch: 0 };

  // ---- state and autosave -------------------------------------------------
  function blank() { return { c1: "", c2: "", c3: "", c4: "", c5: "", c6: "", verdict: "", confidence: null, comment: "" }; }
  let st = { answers: {}, index: 0, montage: 0, sens: D.sensitivity, tb: D.timeBase, lff: F0.low, hff: F0.high, notch: F0.notch, auto: false };
  let storageOK = true;
  try {
    const saved = JSON.parse(localStorage.getItem(STORE) || "null");
    if (saved && typeof saved === "object" && saved.answers) st = Object.assign(st, saved);
  } catch (e) { storageOK = false; }
  for (const it of D.items) st.answers[it.code] = Object.assign(blank(), st.answers[it.code] || {});
  st.index = Math.min(Math.max(0, st.index | 0), N - 1);
  st.montage = Math.min(Math.max(0, st.montage | 0), D.montages.length - 1);
  for (const [list, k] of [[SENS, "sens"], [TB, "tb"], [LFF, "lff"], [HFF, "hff"], [NOTCH, "notch"]]) {
    if (typeof st[k] !== "number" || !isFinite(st[k])) st[k] = list[0];
    if (!list.includes(st[k])) list.push(st[k]), list.sort((a, b) => a - b);
  }
  // view: the time at the centre of the traces (null: the event), kept when
  // the time base changes, and the caliper; neither is saved.
  const view = { c: null, cal: null };

  function persist() {
    try { localStorage.setItem(STORE, JSON.stringify(st)); }
    catch (e) {
      if (storageOK) status("This browser does not keep answers for this page: save often with s.", true);
      storageOK = false;
    }
  }
  const cur = () => D.items[st.index];
  const ans = () => st.answers[cur().code];
  const critKeys = ["c1", "c2", "c3", "c4", "c5", "c6"];
  const rated = (a) => critKeys.every((k) => a[k]) && !!a.verdict;
  const touched = (a) => critKeys.some((k) => a[k]) || !!a.verdict || a.confidence != null || a.comment !== "";
  function status(msg, warn) { const s = $("status"); s.textContent = msg; s.title = msg; s.className = "status" + (warn ? " warn" : ""); }
  // ---- decoding -------------------------------------------------------------
  async function gunzip(b64) {
    const bin = atob(b64);
    const u = new Uint8Array(bin.length);
    for (let i = 0; i < bin.length; i++) u[i] = bin.charCodeAt(i);
    const s = new Blob([u]).stream().pipeThrough(new DecompressionStream("gzip"));
    return new Uint8Array(await new Response(s).arrayBuffer());
  }
  const cache = new Map();
  // decode undoes the packet encoding: one byte per zigzag-mapped first
  // difference (255 escapes a 16-bit value), 16-bit wrapping sums, then the
  // per-item µV step.
  function decode(i) {
    if (cache.has(i)) return cache.get(i);
    const it = D.items[i];
    const p = (async () => {
      const b = await gunzip(it.traces);
      const nch = D.electrodes.length, chans = [];
      let k = 0;
      for (let c = 0; c < nch; c++) {
        const x = new Float32Array(it.n);
        let prev = 0;
        for (let j = 0; j < it.n; j++) {
          let z = b[k++];
          if (z === 255) { z = b[k] | (b[k + 1] << 8); k += 2; }
          prev = (prev + ((z >>> 1) ^ -(z & 1))) & 0xffff;
          x[j] = ((prev << 16) >> 16) * it.scale;
        }
        chans.push(x);
      }
      if (k !== b.length) throw new Error("packet data damaged for item " + it.code);
      let map = null;
      if (it.map) {
        const m = await gunzip(it.map.values);
        const v = new Float32Array(it.map.size * it.map.size);
        for (let j = 0; j < v.length; j++) {
          const q = ((m[2 * j] | (m[2 * j + 1] << 8)) << 16) >> 16;
          v[j] = q === -32768 ? NaN : q * it.map.scale;
        }
        map = v;
      }
      return { chans, map };
    })();
    cache.set(i, p);
    if (cache.size > 12) cache.delete(cache.keys().next().value);
    return p;
  }

  function derive(chans, mont) {
    return mont.derivations.map((d) => {
      const x = chans[d.plus], y = new Float32Array(x.length);
      const m = d.minus.length;
      for (let j = 0; j < x.length; j++) {
        let ref = 0;
        for (let q = 0; q < m; q++) ref += chans[d.minus[q]][j];
        y[j] = x[j] - (m ? ref / m : 0);
      }
      return y;
    });
  }


  // ---- display filters ------------------------------------------------------
  // Second-order sections from the bilinear transform with pre-warping
  // (Bristow-Johnson, Audio EQ Cookbook): Butterworth high- and low-pass
  // (Q = 1/√2) and a notch of Q = 30. Each runs forward and then backward
  // (zero phase), so a cut-off is at half amplitude (−6 dB, the square of a
  // Butterworth's −3 dB) and peaks do not move in time.
  function biquad(kind, f, fs) {
    const w = 2 * Math.PI * f / fs, cw = Math.cos(w), q = kind === "notch" ? 30 : Math.SQRT1_2, al = Math.sin(w) / (2 * q);
    let b;
    if (kind === "low") b = [(1 - cw) / 2, 1 - cw, (1 - cw) / 2];
    else if (kind === "high") b = [(1 + cw) / 2, -(1 + cw), (1 + cw) / 2];
    else b = [1, -2 * cw, 1];
    const a0 = 1 + al;
    return [b[0] / a0, b[1] / a0, b[2] / a0, -2 * cw / a0, (1 - al) / a0];
  }
  function sections(fs, s) {
    const out = [], nyq = fs / 2;
    if (s.lff > 0 && s.lff < 0.45 * fs) out.push(biquad("high", s.lff, fs));
    if (s.hff > 0 && s.hff < 0.45 * fs) out.push(biquad("low", s.hff, fs));
    if (s.notch > 0 && s.notch < nyq * 0.9) out.push(biquad("notch", s.notch, fs));
    return out;
  }
  // run filters x in place (direct form II transposed), starting from the
  // steady state of the first sample so a step at the start does not ring.
  function run(c, x) {
    const [b0, b1, b2, a1, a2] = c, n = x.length;
    if (!n) return;
    const x0 = x[0], dc = (b0 + b1 + b2) / (1 + a1 + a2);
    let z1 = x0 * (dc - b0), z2 = x0 * (b2 - a2 * dc);
    for (let j = 0; j < n; j++) {
      const v = x[j], y = b0 * v + z1;
      z1 = b1 * v - a1 * y + z2;
      z2 = b2 * v - a2 * y;
      x[j] = y;
    }
  }
  // filtfilt pads x at both ends with its odd reflection (2 s or what there
  // is) so the edges of the context stay quiet, then filters forward and back.
  function filtfilt(x, fs, s) {
    const secs = sections(fs, s);
    if (!secs.length) return x;
    const n = x.length, p = Math.min(n - 1, Math.round(2 * fs));
    const y = new Float64Array(n + 2 * p);
    for (let j = 0; j < p; j++) {
      y[j] = 2 * x[0] - x[p - j];
      y[n + p + j] = 2 * x[n - 1] - x[n - 2 - j];
    }
    for (let j = 0; j < n; j++) y[p + j] = x[j];
    for (const c of secs) { run(c, y); y.reverse(); run(c, y); y.reverse(); }
    return Float32Array.from(y.subarray(p, p + n));
  }
  function filterText(s) {
    const parts = [];
    parts.push(s.lff > 0 ? "LFF " + s.lff + " Hz" : "LFF off");
    parts.push(s.hff > 0 ? "HFF " + s.hff + " Hz" : "HFF off");
    parts.push(s.notch > 0 ? "notch " + s.notch + " Hz" : "notch off");
    return parts.join(" · ");
  }
  const shownCache = new Map();
  // shown returns the traces as displayed: montage, then filters.
  function shown(i, chans) {
    const it = D.items[i], key = [i, st.montage, st.lff, st.hff, st.notch].join("|");
    if (shownCache.has(key)) return shownCache.get(key);
    const rows = derive(chans, D.montages[st.montage]).map((x) => filtfilt(x, it.rate, st));
    shownCache.set(key, rows);
    if (shownCache.size > 6) shownCache.delete(shownCache.keys().next().value);
    return rows;
  }

  // ---- drawing --------------------------------------------------------------
  const PX_PER_MM = 96 / 25.4; // CSS reference pixel (CSS Values 4 §6.2)
  const LABEL_W = 70, TOP = 16, BOTTOM = 22, RIGHT = 8;
  let drawSeq = 0, geo = null;
  async function draw() {
    const seq = ++drawSeq, i = st.index, it = D.items[i];
    const dec = await decode(i);
    if (seq !== drawSeq) return;
    drawTraces(i, it, shown(i, dec.chans));
    drawMap(it, dec.map);
  }
  function noteSignal(it) {
    const dec = it.cond ? it.cond : "as packed";
    $("signal-note").textContent = "In force: " + filterText(st) + " (zero phase) · " + it.rate + " samples/s · data " + dec;
  }

  function geometry(it, W, H, nrows) {
    const plotW = W - LABEL_W - RIGHT, pxPerSec = st.tb * PX_PER_MM, span = plotW / pxPerSec;
    const dur = it.n / it.rate;
    const maxT0 = Math.max(0, dur - span);
    let t0 = (view.c == null ? it.eventAt : view.c) - span / 2;
    t0 = Math.max(0, Math.min(t0, maxT0));
    if (span >= dur) t0 = (dur - span) / 2; // all of it fits: centre it
    if (view.c != null) view.c = t0 + span / 2;
    const rowH = (H - TOP - BOTTOM) / Math.max(1, nrows);
    return { W, H, t0, span, dur, maxT0, pxPerSec, plotW, rowH, yGain: PX_PER_MM / st.sens, rate: it.rate };
  }
  const xOf = (g, t) => LABEL_W + (t - g.t0) * g.pxPerSec;
  const tOf = (g, x) => g.t0 + (x - LABEL_W) / g.pxPerSec;
  const baseOf = (g, r) => TOP + g.rowH * (r + 0.5);

  function drawTraces(i, it, rows) {
    const cv = $("traces"), dpr = window.devicePixelRatio || 1;
    const W = cv.clientWidth, H = cv.clientHeight;
    cv.width = Math.round(W * dpr); cv.height = Math.round(H * dpr);
    const g = cv.getContext("2d");
    g.setTransform(dpr, 0, 0, dpr, 0, 0);
    g.fillStyle = "#ffffff"; g.fillRect(0, 0, W, H);
    const mont = D.montages[st.montage], G = geometry(it, W, H, rows.length);
    geo = Object.assign(G, { rows, labels: mont.derivations.map((d) => d.label), item: i });
    const yb = H - BOTTOM;
    g.save();
    g.beginPath(); g.rect(LABEL_W, 0, G.plotW, H); g.clip();
    // Context outside the rated window is shaded.
    g.fillStyle = "#e9edf1";
    const xa = xOf(G, it.from), xb = xOf(G, it.to);
    const xs = Math.max(LABEL_W, xOf(G, 0)), xz = Math.min(W - RIGHT, xOf(G, G.dur));
    if (xa > xs) g.fillRect(xs, TOP, xa - xs, yb - TOP);
    if (xb < xz) g.fillRect(xb, TOP, xz - xb, yb - TOP);
    // Grid: a line each second counted from the event, fainter each 0.2 s.
    const fine = G.pxPerSec * 0.2 >= 8;
    for (let k = Math.ceil((G.t0 - it.eventAt) / 0.2); ; k++) {
      const t = it.eventAt + k * 0.2;
      if (t > Math.min(G.t0 + G.span, G.dur)) break;
      if (t < 0) continue;
      const whole = k % 5 === 0;
      if (!whole && !fine) continue;
      const x = Math.round(xOf(G, t)) + 0.5;
      g.strokeStyle = whole ? "#c9d0d8" : "#eceff2"; g.lineWidth = 1;
      g.beginPath(); g.moveTo(x, TOP); g.lineTo(x, yb); g.stroke();
    }
    // Event marker.
    const xe = xOf(G, it.eventAt);
    g.strokeStyle = "#a3155f"; g.lineWidth = 1.25; g.setLineDash([5, 4]);
    g.beginPath(); g.moveTo(xe, TOP); g.lineTo(xe, yb); g.stroke();
    g.setLineDash([]);
    g.fillStyle = "#a3155f";
    g.beginPath(); g.moveTo(xe - 6, 2); g.lineTo(xe + 6, 2); g.lineTo(xe, 11); g.closePath(); g.fill();
    // Traces, negative up.
    g.strokeStyle = "#111820"; g.lineWidth = 1;
    const j0 = Math.max(0, Math.floor(G.t0 * it.rate)), j1 = Math.min(it.n - 1, Math.ceil((G.t0 + G.span) * it.rate));
    rows.forEach((y, r) => {
      const base = baseOf(G, r);
      g.beginPath();
      for (let j = j0; j <= j1; j++) {
        const px = xOf(G, j / it.rate), py = base + y[j] * G.yGain;
        if (j === j0) g.moveTo(px, py); else g.lineTo(px, py);
      }
      g.stroke();
    });
    drawCaliper(g, G, rows);
    g.restore();
    // Channel labels.
    g.fillStyle = "#16202a"; g.font = "12px system-ui, sans-serif"; g.textBaseline = "middle"; g.textAlign = "right";
    geo.texts = [];
    geo.labels.forEach((l, r) => label(g, l, LABEL_W - 6, baseOf(G, r)));
    // Time from the event along the bottom edge, every 2 s, 1 s or 0.2 s
    // so that labels stay about 50 px or more apart.
    const sc = scaleOf(G);
    g.fillStyle = "#4d5966"; g.font = "11px system-ui, sans-serif"; g.textBaseline = "top"; g.textAlign = "center";
    const step = G.pxPerSec >= 250 ? 0.2 : G.pxPerSec >= 50 ? 1 : 2;
    for (let k = Math.ceil((G.t0 - it.eventAt) / step - 1e-9); ; k++) {
      const dt = k * step, x = xOf(G, it.eventAt + dt);
      if (x > W - RIGHT || it.eventAt + dt > G.dur + 1e-9) break;
      if (it.eventAt + dt < -1e-9) continue;
      if (x < LABEL_W + 12 || x > sc.x0 - 24) continue; // clear of the scale bars
      const v = Math.abs(dt) < 1e-9 ? "0 s" : (dt > 0 ? "+" : "\u2212") + (step < 1 ? Math.abs(dt).toFixed(1) : Math.abs(dt)) + " s";
      label(g, v, x, yb + 4);
    }
    g.textAlign = "left";
    label(g, "Time from the event. Grey: context outside the rated window.", LABEL_W + 2, 2);
    drawScale(g, G, sc);
  }

  // label writes a text on a pale box, so that traces running through the
  // margins do not hide it, and keeps the drawn box (the text metrics of the
  // canvas, HTML Living Standard §4.12.5.1.10) so that a test can check that
  // no two labels overlap.
  function label(g, text, x, y) {
    const m = g.measureText(text);
    const box = [x - m.actualBoundingBoxLeft, y - m.actualBoundingBoxAscent, x + m.actualBoundingBoxRight, y + m.actualBoundingBoxDescent];
    const ink = g.fillStyle;
    g.fillStyle = "rgba(255,255,255,0.85)";
    g.fillRect(box[0] - 1, box[1] - 1, box[2] - box[0] + 2, box[3] - box[1] + 2);
    g.fillStyle = ink;
    g.fillText(text, x, y);
    geo.texts.push({ text, box });
  }

  // scaleOf picks a time bar of at most 150 px (1 s, 0.5 s or 0.2 s) and
  // places it at the lower right.
  function scaleOf(G) {
    let secs = 1;
    for (const s of [1, 0.5, 0.2, 0.1]) { secs = s; if (s * G.pxPerSec <= 150) break; }
    const barT = secs * G.pxPerSec, xr = G.W - RIGHT - 44;
    return { secs, barT, barV: 50 * G.yGain, xr, x0: xr - barT, yb: G.H - BOTTOM + 2 };
  }
  // drawScale draws the time and 50 µV bars, each label on its own side
  // (time below its bar, voltage right of its bar), so they cannot overlap
  // at any time base or sensitivity.
  function drawScale(g, G, sc) {
    const { barT, barV, xr, yb } = sc;
    g.fillStyle = "rgba(255,255,255,0.85)";
    g.fillRect(xr + 2, yb - barV / 2 - 8, 42, 16);
    g.strokeStyle = "#16202a"; g.lineWidth = 2;
    g.beginPath(); g.moveTo(xr - barT, yb); g.lineTo(xr, yb); g.lineTo(xr, yb - barV); g.stroke();
    g.fillStyle = "#16202a"; g.font = "11px system-ui, sans-serif";
    g.textAlign = "center"; g.textBaseline = "top";
    label(g, sc.secs >= 1 ? "1 s" : sc.secs * 1000 + " ms", xr - barT / 2, yb + 3);
    g.textAlign = "left"; g.textBaseline = "middle";
    label(g, "50 µV", xr + 4, yb - barV / 2);
  }

  // ---- caliper --------------------------------------------------------------
  // The caliper snaps both ends to samples of the trace where the drag began
  // and reports the time between them and the difference of the trace there.
  function rowAt(y) {
    if (!geo) return -1;
    const r = Math.floor((y - TOP) / geo.rowH);
    return r >= 0 && r < geo.rows.length ? r : -1;
  }
  function sampleAt(x) {
    const j = Math.round(tOf(geo, x) * geo.rate);
    return Math.max(0, Math.min(geo.rows[0].length - 1, j));
  }
  function drawCaliper(g, G, rows) {
    const c = view.cal;
    if (!c || c.item !== st.index || c.row >= rows.length) return;
    const y = rows[c.row], base = baseOf(G, c.row);
    const xa = xOf(G, c.j0 / G.rate), xb = xOf(G, c.j1 / G.rate);
    const ya = base + y[c.j0] * G.yGain, yb = base + y[c.j1] * G.yGain;
    g.strokeStyle = "#a3155f"; g.fillStyle = "#a3155f"; g.lineWidth = 1.5;
    for (const [x, yy] of [[xa, ya], [xb, yb]]) {
      g.beginPath(); g.moveTo(x, base - G.rowH * 0.9); g.lineTo(x, base + G.rowH * 0.9); g.stroke();
      g.beginPath(); g.arc(x, yy, 3, 0, 2 * Math.PI); g.fill();
    }
    g.setLineDash([3, 3]);
    g.beginPath(); g.moveTo(xa, ya); g.lineTo(xb, ya); g.lineTo(xb, yb); g.stroke();
    g.setLineDash([]);
  }
  function caliperText() {
    const c = view.cal, o = $("caliper");
    if (!c || c.item !== st.index || !geo) { o.textContent = "Drag along a trace to measure duration and amplitude."; o.className = "caliper"; return; }
    const y = geo.rows[c.row], dt = (c.j1 - c.j0) / geo.rate * 1000, dv = y[c.j1] - y[c.j0];
    c.ms = dt; c.uv = dv;
    o.textContent = geo.labels[c.row] + ": " + Math.abs(dt).toFixed(1) + " ms (" + Math.abs(c.j1 - c.j0) + " samples), " +
      (dv >= 0 ? "+" : "\u2212") + Math.abs(dv).toFixed(1) + " µV (negative up: + is downward)";
    o.className = "caliper on";
  }
  function canvasXY(ev) {
    const r = $("traces").getBoundingClientRect();
    return [ev.clientX - r.left, ev.clientY - r.top];
  }
  let dragging = false;
  function calDown(ev) {
    if (ev.button !== 0 || !geo) return;
    const [x, y] = canvasXY(ev), r = rowAt(y);
    if (r < 0 || x < LABEL_W) return;
    const j = sampleAt(x);
    view.cal = { item: st.index, row: r, j0: j, j1: j };
    dragging = true;
    ev.preventDefault();
    redrawNow();
  }
  function calMove(ev) {
    if (!dragging || !view.cal) return;
    view.cal.j1 = sampleAt(canvasXY(ev)[0]);
    redrawNow();
  }
  function calUp(ev) { if (dragging) { calMove(ev); dragging = false; } }
  function redrawNow() {
    const p = cache.get(st.index);
    if (!p) return (later = draw());
    later = p.then((dec) => { drawTraces(st.index, D.items[st.index], shown(st.index, dec.chans)); caliperText(); syncPan(); });
  }
  function pan(dt) {
    if (!geo) return;
    view.c = Math.max(0, Math.min(geo.maxT0, geo.t0 + dt)) + geo.span / 2;
    redrawNow();
  }
  function syncPan() {
    const p = $("pan");
    if (!geo) return;
    p.max = String(geo.maxT0 || 0); p.step = "0.05"; p.value = String(geo.t0);
    p.disabled = !(geo.maxT0 > 0);
  }
  // A diverging palette of our own: deep blue (negative) through warm grey
  // (zero) to burnt orange (positive); the two arms differ in hue and in
  // lightness, so they stay apart for red–green colour-blind readers.
  const STOPS = [[-1, [24, 64, 125]], [-0.5, [112, 156, 207]], [0, [238, 235, 228]], [0.5, [233, 160, 92]], [1, [127, 59, 8]]];
  function colour(t) {
    t = Math.max(-1, Math.min(1, t));
    for (let k = 1; k < STOPS.length; k++) {
      if (t <= STOPS[k][0]) {
        const [a, ca] = STOPS[k - 1], [b, cb] = STOPS[k], f = (t - a) / (b - a);
        return ca.map((v, q) => Math.round(v + f * (cb[q] - v)));
      }
    }
    return STOPS[STOPS.length - 1][1];
  }
  function niceCeil(v) {
    if (!(v > 0)) return 1;
    const p = Math.pow(10, Math.floor(Math.log10(v)));
    for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= v) return m * p;
    return 10 * p;
  }

  function drawMap(it, v) {
    const cv = $("map"), g = cv.getContext("2d"), S = cv.width;
    g.clearRect(0, 0, S, S);
    const cb = $("colorbar"), h = cb.getContext("2d");
    h.clearRect(0, 0, cb.width, cb.height);
    if (!v) {
      g.fillStyle = "#4a5360"; g.font = "13px system-ui, sans-serif"; g.textAlign = "center";
      g.fillText("No map for this item", S / 2, S / 2);
      return;
    }
    const n = it.map.size;
    let peak = 0;
    for (const x of v) if (!Number.isNaN(x)) peak = Math.max(peak, Math.abs(x));
    const lim = niceCeil(peak);
    const off = document.createElement("canvas");
    off.width = n; off.height = n;
    const og = off.getContext("2d"), img = og.createImageData(n, n);
    for (let j = 0; j < n * n; j++) {
      if (Number.isNaN(v[j])) continue; // transparent outside the head
      const c = colour(v[j] / lim);
      img.data[4 * j] = c[0]; img.data[4 * j + 1] = c[1]; img.data[4 * j + 2] = c[2]; img.data[4 * j + 3] = 255;
    }
    og.putImageData(img, 0, 0);
    const pad = 14, side = S - 2 * pad;
    g.imageSmoothingEnabled = true;
    g.drawImage(off, pad, pad, side, side);
    const cx = S / 2, cy = S / 2, R = side / 2;
    g.strokeStyle = "#1b1f24"; g.lineWidth = 1.5;
    g.beginPath(); g.arc(cx, cy, R, 0, 2 * Math.PI); g.stroke();
    g.beginPath(); g.moveTo(cx - 8, cy - R + 1); g.lineTo(cx, cy - R - 10); g.lineTo(cx + 8, cy - R + 1); g.stroke();
    g.font = "9px system-ui, sans-serif"; g.textAlign = "center"; g.textBaseline = "top";
    for (const e of it.map.electrodes) {
      const x = cx + e.x * R, y = cy - e.y * R;
      g.beginPath(); g.arc(x, y, 2.6, 0, 2 * Math.PI);
      g.fillStyle = "#1b1f24"; g.fill();
      g.strokeStyle = "#ffffff"; g.lineWidth = 1; g.stroke();
      g.fillStyle = "#1b1f24"; g.fillText(e.name, x, y + 3);
    }
    const top = 14, bot = cb.height - 14, bw = 16;
    for (let y = top; y <= bot; y++) {
      const c = colour(1 - 2 * (y - top) / (bot - top));
      h.fillStyle = "rgb(" + c.join(",") + ")"; h.fillRect(4, y, bw, 1);
    }
    h.strokeStyle = "#1b1f24"; h.strokeRect(4.5, top + 0.5, bw, bot - top);
    h.fillStyle = "#1b1f24"; h.font = "11px system-ui, sans-serif"; h.textAlign = "left"; h.textBaseline = "middle";
    h.fillText("+" + lim + " µV", bw + 8, top);
    h.fillText("0", bw + 8, (top + bot) / 2);
    h.fillText("\u2212" + lim + " µV", bw + 8, bot);
  }

  // ---- form -----------------------------------------------------------------
  const CHOICES = [["present", "present"], ["absent", "absent"], [CJ, "cannot judge"]];
  function buildForm() {
    const fs = $("criteria-set");
    CRIT.forEach(([name, def], q) => {
      const k = "c" + (q + 1), row = document.createElement("div");
      row.className = "crit"; row.id = "row-" + k;
      row.innerHTML = '<span class="num" aria-hidden="true">' + (q + 1) + '</span><span class="name"></span>' +
        CHOICES.map(([v]) => '<label><input type="radio" name="' + k + '" value="' + v + '"></label>').join("");
      row.querySelector(".name").textContent = name;
      row.querySelector(".name").title = def;
      row.querySelectorAll("input").forEach((r, x) => r.setAttribute("aria-label", "Criterion " + (q + 1) + ", " + name + ": " + CHOICES[x][1]));
      fs.appendChild(row);
      const li = document.createElement("li");
      li.innerHTML = "<strong></strong> ";
      li.querySelector("strong").textContent = name + ".";
      li.appendChild(document.createTextNode(def));
      $("criteria-list").appendChild(li);
    });
    const cs = $("conf-set");
    for (let c = 1; c <= 5; c++) {
      const l = document.createElement("label");
      l.innerHTML = '<input type="radio" name="confidence" value="' + c + '"> ' + c;
      cs.appendChild(l);
    }
    $("form").addEventListener("change", (ev) => {
      const t = ev.target, a = ans();
      if (t.name && /^c[1-6]$/.test(t.name)) a[t.name] = t.value;
      else if (t.name === "verdict") { a.verdict = t.value; changed(false); return maybeAdvance(); }
      else if (t.name === "confidence") a.confidence = +t.value;
      else if (t.id === "auto") st.auto = t.checked;
      changed(false);
    });
    $("comment").addEventListener("input", () => { ans().comment = $("comment").value; changed(false); });
    $("conf-clear").addEventListener("click", () => { ans().confidence = null; changed(false); });
    $("form").addEventListener("submit", (ev) => ev.preventDefault());
  }

  function syncForm() {
    const a = ans();
    for (const k of critKeys) {
      document.querySelectorAll('input[name="' + k + '"]').forEach((r) => (r.checked = r.value === a[k]));
      $("row-" + k).classList.toggle("unset", !a[k] && touched(a));
    }
    document.querySelectorAll('input[name="verdict"]').forEach((r) => (r.checked = r.value === a.verdict));
    document.querySelectorAll('input[name="confidence"]').forEach((r) => (r.checked = +r.value === a.confidence));
    if ($("comment").value !== a.comment) $("comment").value = a.comment;
    $("auto").checked = !!st.auto;
    const s = $("item-state");
    if (rated(a)) { s.textContent = "Complete \u2713"; s.className = "itemstate done"; }
    else if (touched(a)) { s.textContent = "Incomplete: not merged until all six and the verdict are answered."; s.className = "itemstate todo"; }
    else { s.textContent = "Not rated yet."; s.className = "itemstate"; }
  }

  function countDone() { return D.items.filter((it) => rated(st.answers[it.code])).length; }
  function syncChrome() {
    const repeats = N - (D.events || N);
    $("progress").textContent = countDone() + " of " + N + " items complete" + (repeats > 0 ? " (" + D.events + " events; " + repeats + " shown twice)" : "");
    $("item-code").textContent = cur().code;
    const j = $("jump");
    for (let i = 0; i < N; i++) {
      const a = st.answers[D.items[i].code];
      const txt = (i + 1) + " of " + N + (rated(a) ? " \u2713" : touched(a) ? " \u2026" : "");
      if (j.options[i].text !== txt) j.options[i].text = txt;
    }
    j.value = String(st.index);
    for (const k of ["montage", "sens", "tb", "lff", "hff", "notch"]) $(k).value = String(st[k]);
    noteSignal(cur());
  }

  function changed(redraw) {
    persist(); syncForm(); syncChrome();
    if (redraw) later = draw().then(() => { caliperText(); syncPan(); });
  }
  let later = Promise.resolve();

  function go(i) {
    if (i < 0 || i >= N || i === st.index) return;
    st.index = i; view.c = null; view.cal = null;
    status(""); // a message about the last item or save must not linger here
    persist(); syncForm(); syncChrome(); later = draw().then(() => { caliperText(); syncPan(); });
  }
  function nextOpen() {
    for (let d = 1; d <= N; d++) {
      const i = (st.index + d) % N;
      if (!rated(st.answers[D.items[i].code])) return go(i);
    }
    status("Every item is complete. Save with s.");
  }
  function maybeAdvance() {
    if (st.auto && rated(ans())) nextOpen();
  }
  function step(list, key, dir) {
    const k = list.indexOf(st[key]) + dir;
    if (k >= 0 && k < list.length) { st[key] = list[k]; changed(true); }
  }

  // ---- save -----------------------------------------------------------------
  function save() {
    const answers = [], open = [];
    for (const it of D.items) {
      const a = st.answers[it.code];
      if (!touched(a)) continue;
      if (!rated(a)) open.push(it.code);
      answers.push({ item: it.code, c1: a.c1, c2: a.c2, c3: a.c3, c4: a.c4, c5: a.c5, c6: a.c6, verdict: a.verdict, confidence: a.confidence, comment: a.comment });
    }
    const ret = { format: "quorate-return", version: 1, study: D.study, packet: D.packet, rater: D.rater, check: D.check, answers };
    const blob = new Blob([JSON.stringify(ret, null, 1) + "\n"], { type: "application/json" });
    const url = URL.createObjectURL(blob);
    const a = document.createElement("a");
    a.href = url; a.download = D.packet + ".json";
    document.body.appendChild(a); a.click(); a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 10000);
    const done = answers.length - open.length, owed = N - done;
    if (open.length) status("Saved " + D.packet + ".json: " + done + " complete items will be merged. Incomplete, not merged and still owed (the coordinator sees these codes): " + open.join(", "), true);
    else status("Saved " + D.packet + ".json: " + done + " complete items will be merged" + (owed ? "; " + owed + " not yet rated are still owed" : "") + ". Send this file back.");
  }

  // ---- keyboard -------------------------------------------------------------
  function setCrit(q) {
    const a = ans(), k = "c" + q;
    a[k] = a[k] === "present" ? "absent" : a[k] === "absent" ? CJ : "present";
    changed(false);
  }
  function restAbsent() {
    const a = ans();
    for (const k of critKeys) if (!a[k]) a[k] = "absent";
    changed(false);
  }
  function setVerdict(v) { ans().verdict = v; changed(false); maybeAdvance(); }
  // keyOf names a key by what it prints, falling back to its position when
  // the layout prints something else there (non-Latin letters) or nothing
  // (dead keys), so every command is one key on every layout.
  function keyOf(ev) {
    const k = ev.key || "";
    if (k.length === 1 && k.charCodeAt(0) < 128) return k;
    if (k.length > 1 && k !== "Dead" && k !== "Unidentified" && k !== "Process") return k;
    const c = ev.code || "";
    let m = /^Key([A-Z])$/.exec(c);
    if (m) return ev.shiftKey ? m[1] : m[1].toLowerCase();
    m = { Comma: ",", Period: ".", Equal: "+", Minus: "-", NumpadAdd: "+", NumpadSubtract: "-", Slash: "?" }[c];
    return m || k;
  }
  let confNext = false; // "c" was pressed: the next digit is the confidence
  function onKey(ev) {
    // AltGr arrives as Ctrl+Alt (Windows) or as the AltGraph modifier (X11,
    // macOS Option): its characters are for text, never commands, so that
    // AltGr+5 ("[" on AZERTY) does not set criterion 5. No command needs it.
    if (ev.ctrlKey || ev.metaKey || ev.altKey || (ev.getModifierState && ev.getModifierState("AltGraph"))) return;
    const t = ev.target, tag = t && t.tagName;
    if (tag === "TEXTAREA" || (tag === "INPUT" && t.type === "text")) {
      if (ev.key === "Escape") { t.blur(); ev.preventDefault(); }
      return;
    }
    const key = keyOf(ev);
    if (document.querySelector("dialog[open]")) {
      if (key === "?" || key === "h" || key === "d") { document.querySelectorAll("dialog[open]").forEach((d) => d.close()); ev.preventDefault(); }
      return;
    }
    const inControl = tag === "INPUT" || tag === "SELECT";
    // Digits are read by position (Digit1, Numpad1…), with or without Shift,
    // so they work where the row prints other characters first (AZERTY).
    const m = /^(?:Digit|Numpad)([0-9])$/.exec(ev.code || "");
    const conf = confNext;
    confNext = false;
    if (conf && !m) status("");
    if (m) {
      const q = +m[1];
      if (conf && q <= 5) { ans().confidence = q || null; status(""); changed(false); }
      else if (q >= 1 && q <= 6) setCrit(q);
      else return;
      ev.preventDefault();
      return;
    }
    switch (key) {
      case "a": restAbsent(); break;
      case "c": confNext = true; status("Confidence: press 1 (low) to 5 (high), or 0 to clear."); break;
      case "e": setVerdict("epileptiform"); break;
      case "n": setVerdict("not-epileptiform"); break;
      case "x": setVerdict(CJ); break;
      case "j": case "PageDown": go(st.index + 1); break;
      case "k": case "PageUp": go(st.index - 1); break;
      case "ArrowRight": if (inControl) return; pan(1); break;
      case "ArrowLeft": if (inControl) return; pan(-1); break;
      case "Home": if (inControl) return; view.c = null; redrawNow(); break;
      case "u": nextOpen(); break;
      case "m": st.montage = (st.montage + 1) % D.montages.length; changed(true); break;
      case "M": st.montage = (st.montage + D.montages.length - 1) % D.montages.length; changed(true); break;
      case "+": case "=": case "ArrowUp": if (inControl && key === "ArrowUp") return; step(SENS, "sens", -1); break;
      case "-": case "_": case "ArrowDown": if (inControl && key === "ArrowDown") return; step(SENS, "sens", +1); break;
      case ".": case ">": step(TB, "tb", +1); break;
      case ",": case "<": step(TB, "tb", -1); break;
      case "f": toggleFilters(); break;
      case "t": $("comment").focus(); break;
      case "d": $("criteria").showModal(); break;
      case "?": case "h": $("help").showModal(); break;
      case "s": save(); break;
      default: return;
    }
    ev.preventDefault();
  }
  function toggleFilters() {
    if (st.lff || st.hff || st.notch) { st.lff = 0; st.hff = 0; st.notch = 0; }
    else { st.lff = F0.low; st.hff = F0.high; st.notch = F0.notch; }
    changed(true);
  }

  // ---- start ----------------------------------------------------------------
  function fill(sel, values, fmt) {
    values.forEach((v, i) => { const o = document.createElement("option"); o.value = String(fmt === true ? i : v); o.textContent = typeof fmt === "function" ? fmt(v) : String(v); sel.appendChild(o); });
  }
  const hz = (v) => (v === 0 ? "off" : v + " Hz");
  $("packet-id").textContent = D.packet;
  fill($("montage"), D.montages.map((m) => m.name), true);
  fill($("sens"), SENS);
  fill($("tb"), TB);
  fill($("lff"), LFF, hz);
  fill($("hff"), HFF, hz);
  fill($("notch"), NOTCH, hz);
  fill($("jump"), D.items.map(() => ""), true);
  buildForm();
  for (const k of ["montage", "sens", "tb", "lff", "hff", "notch"]) $(k).addEventListener("change", (e) => { st[k] = +e.target.value; changed(true); });
  $("jump").addEventListener("change", (e) => go(+e.target.value));
  $("prev").addEventListener("click", () => go(st.index - 1));
  $("next").addEventListener("click", () => go(st.index + 1));
  $("next-open").addEventListener("click", nextOpen);
  $("btn-save").addEventListener("click", save);
  $("btn-filters").addEventListener("click", toggleFilters);
  $("btn-help").addEventListener("click", () => $("help").showModal());
  $("btn-criteria").addEventListener("click", () => $("criteria").showModal());
  $("pan").addEventListener("input", (e) => { view.c = +e.target.value + (geo ? geo.span / 2 : 0); redrawNow(); });
  const cv = $("traces");
  cv.addEventListener("mousedown", calDown);
  window.addEventListener("mousemove", calMove);
  window.addEventListener("mouseup", calUp);
  document.addEventListener("keydown", onKey);
  let rz = 0;
  window.addEventListener("resize", () => { clearTimeout(rz); rz = setTimeout(redrawNow, 120); });
  if (typeof DecompressionStream === "undefined") status("This browser is too old to show the traces (it lacks DecompressionStream); please use a current browser.", true);
  syncForm(); syncChrome();
  // window.quorate lets a test or a curious rater inspect the page state.
  window.quorate = {
    ready: draw().then(() => { caliperText(); syncPan(); return true; }),
    decode: (i) => decode(i).then((d) => d.chans.map((c) => Array.from(c))),
    state: () => JSON.parse(JSON.stringify(st)),
    settled: () => later.then(() => true), // the last redraw has finished
    texts: () => (geo ? geo.texts : []),
    caliper: () => (view.cal ? { ms: view.cal.ms, uv: view.cal.uv, row: view.cal.row, samples: view.cal.j1 - view.cal.j0 } : null),
    // at gives the page position of time t (s from the excerpt's start) on row r.
    at: (t, r) => { const b = $("traces").getBoundingClientRect(); return { x: b.left + xOf(geo, t), y: b.top + baseOf(geo, r) }; },
    filter: (x, rate, lff, hff, notch) => Array.from(filtfilt(Float32Array.from(x), rate, { lff, hff, notch })),
    save,
  };
})();
