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
  const $ = (id) => document.getElementById(id);
  const N = D.items.length;

  // ---- state and autosave -------------------------------------------------
  function blank() { return { c1: "", c2: "", c3: "", c4: "", c5: "", c6: "", verdict: "", confidence: null, comment: "" }; }
  let st = { answers: {}, index: 0, montage: 0, sens: D.sensitivity, tb: D.timeBase };
  let storageOK = true;
  try {
    const saved = JSON.parse(localStorage.getItem(STORE) || "null");
    if (saved && typeof saved === "object" && saved.answers) st = Object.assign(st, saved);
  } catch (e) { storageOK = false; }
  for (const it of D.items) {
    const a = Object.assign(blank(), st.answers[it.code] || {});
    st.answers[it.code] = a;
  }
  st.index = Math.min(Math.max(0, st.index | 0), N - 1);
  st.montage = Math.min(Math.max(0, st.montage | 0), D.montages.length - 1);
  if (!SENS.includes(st.sens)) SENS.push(st.sens), SENS.sort((a, b) => a - b);
  if (!TB.includes(st.tb)) TB.push(st.tb), TB.sort((a, b) => a - b);

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
  function status(msg, warn) { const s = $("status"); s.textContent = msg; s.className = "status" + (warn ? " warn" : ""); }

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

  // ---- drawing --------------------------------------------------------------
  const PX_PER_MM = 96 / 25.4; // CSS reference pixel (CSS Values 4 §6.2)
  let drawSeq = 0;
  async function draw() {
    const seq = ++drawSeq, i = st.index, it = D.items[i];
    const dec = await decode(i);
    if (seq !== drawSeq) return;
    drawTraces(it, dec.chans);
    drawMap(it, dec.map);
  }

  function drawTraces(it, chans) {
    const cv = $("traces"), dpr = window.devicePixelRatio || 1;
    const W = cv.clientWidth, H = cv.clientHeight;
    cv.width = Math.round(W * dpr); cv.height = Math.round(H * dpr);
    const g = cv.getContext("2d");
    g.setTransform(dpr, 0, 0, dpr, 0, 0);
    g.fillStyle = "#ffffff"; g.fillRect(0, 0, W, H);
    const mont = D.montages[st.montage], rows = derive(chans, mont);
    const labelW = 76, plotW = W - labelW - 8, top = 6, bottom = 26;
    const rowH = (H - top - bottom) / Math.max(1, rows.length);
    const dur = it.n / it.rate, pxPerSec = st.tb * PX_PER_MM, shown = plotW / pxPerSec;
    let t0 = it.eventAt - shown / 2;
    t0 = Math.max(0, Math.min(t0, dur - shown));
    if (shown >= dur) t0 = 0;
    const xOf = (t) => labelW + (t - t0) * pxPerSec;
    const yGain = PX_PER_MM / st.sens; // px per µV
    g.save();
    g.beginPath(); g.rect(labelW, 0, plotW, H); g.clip();
    g.strokeStyle = "#e3e5e8"; g.lineWidth = 1;
    for (let s = Math.ceil(t0); s <= t0 + shown; s++) {
      const x = Math.round(xOf(s)) + 0.5;
      g.beginPath(); g.moveTo(x, top); g.lineTo(x, H - bottom); g.stroke();
    }
    const xe = xOf(it.eventAt);
    g.strokeStyle = "#b0126a"; g.lineWidth = 1.5; g.setLineDash([6, 4]);
    g.beginPath(); g.moveTo(xe, top); g.lineTo(xe, H - bottom); g.stroke();
    g.setLineDash([]);
    g.fillStyle = "#b0126a";
    g.beginPath(); g.moveTo(xe - 6, 0); g.lineTo(xe + 6, 0); g.lineTo(xe, 9); g.closePath(); g.fill();
    g.strokeStyle = "#1b1f24"; g.lineWidth = 1;
    const j0 = Math.max(0, Math.floor(t0 * it.rate)), j1 = Math.min(it.n - 1, Math.ceil((t0 + shown) * it.rate));
    rows.forEach((y, r) => {
      const base = top + rowH * (r + 0.5);
      g.beginPath();
      for (let j = j0; j <= j1; j++) {
        const px = xOf(j / it.rate), py = base + y[j] * yGain; // negative up
        if (j === j0) g.moveTo(px, py); else g.lineTo(px, py);
      }
      g.stroke();
    });
    g.restore();
    g.fillStyle = "#1b1f24"; g.font = "12px system-ui, sans-serif"; g.textBaseline = "middle"; g.textAlign = "right";
    mont.derivations.forEach((d, r) => g.fillText(d.label, labelW - 6, top + rowH * (r + 0.5)));
    // Scale bars: 1 s and 50 µV, so the display can be read on any screen.
    const bx = W - 18, by = H - 8, barV = 50 * yGain, barT = pxPerSec;
    g.strokeStyle = "#1b1f24"; g.lineWidth = 2;
    g.beginPath(); g.moveTo(bx - barT, by); g.lineTo(bx, by); g.lineTo(bx, by - barV); g.stroke();
    g.textAlign = "right"; g.textBaseline = "bottom";
    g.fillText("1 s", bx - barT / 2 + 10, by - 2);
    g.textAlign = "right"; g.textBaseline = "middle";
    g.fillText("50 µV", bx - 4, by - barV / 2);
    g.textAlign = "left"; g.textBaseline = "bottom";
    g.fillText(mont.name + " · " + st.sens + " µV/mm · " + st.tb + " mm/s", labelW, H - 4);
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
  function buildForm() {
    const fs = $("criteria-set");
    CRIT.forEach(([name, def], q) => {
      const k = "c" + (q + 1), row = document.createElement("div");
      row.className = "crit"; row.id = "row-" + k;
      row.innerHTML = '<span class="num" aria-hidden="true">' + (q + 1) + '</span><span class="name" id="lbl-' + k + '" title=""></span>' +
        '<label><input type="radio" name="' + k + '" value="present"> present</label>' +
        '<label><input type="radio" name="' + k + '" value="absent"> absent</label>';
      row.querySelector(".name").textContent = name;
      row.querySelector(".name").title = def;
      row.querySelectorAll("input").forEach((r) => r.setAttribute("aria-label", "Criterion " + (q + 1) + ", " + name + ": " + r.value));
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
      else if (t.name === "verdict") a.verdict = t.value;
      else if (t.name === "confidence") a.confidence = +t.value;
      changed(false);
    });
    $("comment").addEventListener("input", () => { ans().comment = $("comment").value; changed(false); });
    $("conf-clear").addEventListener("click", () => { ans().confidence = null; changed(true); });
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
    const s = $("item-state");
    if (rated(a)) { s.textContent = "Rated \u2713"; s.className = "itemstate done"; }
    else if (touched(a)) { s.textContent = "Incomplete: every criterion and the verdict are needed."; s.className = "itemstate todo"; }
    else { s.textContent = "Not rated yet."; s.className = "itemstate"; }
  }

  function syncChrome() {
    const done = D.items.filter((it) => rated(st.answers[it.code])).length;
    $("progress").textContent = done + " / " + N + " rated";
    $("item-code").textContent = cur().code;
    const j = $("jump");
    for (let i = 0; i < N; i++) {
      const a = st.answers[D.items[i].code];
      const txt = (i + 1) + " of " + N + " \u00b7 " + D.items[i].code + (rated(a) ? " \u2713" : touched(a) ? " \u2026" : "");
      if (j.options[i].text !== txt) j.options[i].text = txt;
    }
    j.value = String(st.index);
    $("montage").value = String(st.montage);
    $("sens").value = String(st.sens);
    $("tb").value = String(st.tb);
  }

  function changed(redraw) {
    persist(); syncForm(); syncChrome();
    if (redraw) draw();
  }

  function go(i) {
    if (i < 0 || i >= N || i === st.index) return;
    st.index = i; persist(); syncForm(); syncChrome(); draw();
  }
  function nextOpen() {
    for (let d = 1; d <= N; d++) {
      const i = (st.index + d) % N;
      if (!rated(st.answers[D.items[i].code])) return go(i);
    }
    status("Every item is rated. Save with s.");
  }
  function step(list, key, dir) {
    const k = list.indexOf(st[key]) + dir;
    if (k >= 0 && k < list.length) { st[key] = list[k]; changed(true); }
  }

  // ---- save -----------------------------------------------------------------
  function save() {
    const answers = [];
    const open = [];
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
    if (open.length) status("Saved " + D.packet + ".json. Incomplete items that the coordinator will query: " + open.join(", "), true);
    else status("Saved " + D.packet + ".json with " + answers.length + " rated item(s). Send this file back.");
  }

  // ---- keyboard -------------------------------------------------------------
  function toggleCrit(q) {
    const a = ans(), k = "c" + q;
    a[k] = a[k] === "present" ? "absent" : "present";
    changed(false);
  }
  function onKey(ev) {
    if (ev.ctrlKey || ev.metaKey || ev.altKey) return;
    const t = ev.target, tag = t && t.tagName;
    if (tag === "TEXTAREA" || (tag === "INPUT" && t.type === "text")) {
      if (ev.key === "Escape") { t.blur(); ev.preventDefault(); }
      return;
    }
    if (document.querySelector("dialog[open]")) {
      if (ev.key === "?" || ev.key === "h" || ev.key === "c") { document.querySelectorAll("dialog[open]").forEach((d) => d.close()); ev.preventDefault(); }
      return;
    }
    const inControl = tag === "INPUT" || tag === "SELECT";
    const m = /^(?:Digit|Numpad)([0-9])$/.exec(ev.code || "");
    if (m) {
      const q = +m[1];
      if (ev.shiftKey && q >= 1 && q <= 5) { ans().confidence = q; changed(false); }
      else if (q === 0) { ans().confidence = null; changed(false); }
      else if (!ev.shiftKey && q >= 1 && q <= 6) toggleCrit(q);
      else return;
      ev.preventDefault();
      return;
    }
    switch (ev.key) {
      case "e": ans().verdict = "epileptiform"; changed(false); break;
      case "n": ans().verdict = "not-epileptiform"; changed(false); break;
      case "j": go(st.index + 1); break;
      case "k": go(st.index - 1); break;
      case "ArrowRight": if (inControl) return; go(st.index + 1); break;
      case "ArrowLeft": if (inControl) return; go(st.index - 1); break;
      case "u": nextOpen(); break;
      case "m": st.montage = (st.montage + 1) % D.montages.length; changed(true); break;
      case "M": st.montage = (st.montage + D.montages.length - 1) % D.montages.length; changed(true); break;
      case "+": case "=": step(SENS, "sens", -1); break;
      case "-": case "_": step(SENS, "sens", +1); break;
      case "]": step(TB, "tb", +1); break;
      case "[": step(TB, "tb", -1); break;
      case "t": $("comment").focus(); break;
      case "c": $("criteria").showModal(); break;
      case "?": case "h": $("help").showModal(); break;
      case "s": save(); break;
      default: return;
    }
    ev.preventDefault();
  }

  // ---- start ----------------------------------------------------------------
  function fill(sel, values, fmt) {
    values.forEach((v, i) => { const o = document.createElement("option"); o.value = String(fmt ? i : v); o.textContent = fmt ? fmt(v) : String(v); sel.appendChild(o); });
  }
  $("packet-id").textContent = D.packet;
  fill($("montage"), D.montages, (m) => m.name);
  fill($("sens"), SENS);
  fill($("tb"), TB);
  fill($("jump"), D.items, () => "");
  buildForm();
  $("montage").addEventListener("change", (e) => { st.montage = +e.target.value; changed(true); });
  $("sens").addEventListener("change", (e) => { st.sens = +e.target.value; changed(true); });
  $("tb").addEventListener("change", (e) => { st.tb = +e.target.value; changed(true); });
  $("jump").addEventListener("change", (e) => go(+e.target.value));
  $("prev").addEventListener("click", () => go(st.index - 1));
  $("next").addEventListener("click", () => go(st.index + 1));
  $("next-open").addEventListener("click", nextOpen);
  $("btn-save").addEventListener("click", save);
  $("btn-help").addEventListener("click", () => $("help").showModal());
  $("btn-criteria").addEventListener("click", () => $("criteria").showModal());
  $("btn-criteria2").addEventListener("click", () => $("criteria").showModal());
  document.addEventListener("keydown", onKey);
  let rz = 0;
  window.addEventListener("resize", () => { clearTimeout(rz); rz = setTimeout(draw, 120); });
  if (typeof DecompressionStream === "undefined") status("This browser is too old to show the traces (it lacks DecompressionStream); please use a current browser.", true);
  syncForm(); syncChrome();
  // window.quorate lets a test or a curious rater inspect the page state.
  window.quorate = { ready: draw().then(() => true), decode: (i) => decode(i).then((d) => d.chans.map((c) => Array.from(c))), state: () => JSON.parse(JSON.stringify(st)), save };
})();
