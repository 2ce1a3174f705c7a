/** The live view's page script (served as /live.js): draws the picture, regions, meters and plots from the state stream; sends the buttons and drawn regions. Plain browser JavaScript, no libraries. */
export const LIVE_PAGE_SCRIPT = String.raw`
'use strict';
(function () {
  var token = document.body.getAttribute('data-token') || '';
  var q = token ? '?t=' + encodeURIComponent(token) : '';
  var state = null;
  var pic = { w: 0, h: 0, image: null, version: -1 };
  var drag = null;
  var $ = function (id) { return document.getElementById(id); };

  function fmt(x, digits) {
    if (x === null || x === undefined || !isFinite(x)) return '–';
    var a = Math.abs(x);
    if (a !== 0 && (a < 1e-3 || a >= 1e5)) return x.toExponential((digits || 3) - 1);
    return String(Number(x.toPrecision(digits || 3)));
  }

  function post(path, body) {
    return fetch(path + q, { method: 'POST', headers: { 'Content-Type': 'application/json', 'X-Kerrtrace': '1' }, body: JSON.stringify(body || {}) })
      .then(function (r) { return r.json().then(function (j) { if (!r.ok) throw new Error(j.error || ('HTTP ' + r.status)); return j; }); });
  }

  function note(text) { $('region-note').textContent = text; }

  // ---------------- state stream ----------------
  function connect() {
    var es = new EventSource('/events' + q);
    es.onopen = function () { $('connection').textContent = 'live'; $('connection').className = 'status'; };
    es.onerror = function () { $('connection').textContent = 'disconnected: reconnecting…'; $('connection').className = 'status down'; };
    es.onmessage = function (ev) {
      try { state = JSON.parse(ev.data); } catch (e) { return; }
      render();
    };
  }

  function render() {
    var s = state;
    var src = s.source;
    var status = src.ended ? 'the clip has ended' : src.paused ? 'camera released (no page was open)' : src.running ? 'running' : (src.problem || 'stopped');
    $('source').textContent = src.label + ' · ' + src.width + '×' + src.height + ' · ' + src.frames + ' frames · ' + status;
    $('roi').textContent = s.regions.roiText || 'none yet';
    var how = { flag: '(given on the command line)', drawn: '(drawn)', found: '(found where the light changes)', brightest: '(a guess: the brightest spot)' };
    $('roi-how').textContent = s.regions.beamHow ? how[s.regions.beamHow] || '' : '';
    $('open-level').textContent = s.capturingOpen ? 'capturing…' : (s.openLevel !== null ? 'open level ' + fmt(s.openLevel) : 'no open level');
    renderMeters(s.meters);
    var rec = s.recording;
    $('record').textContent = rec.active ? 'Stop recording' : 'Start recording';
    $('record').className = rec.active ? 'on' : '';
    $('record-status').textContent = rec.active ? 'recording ' + fmt(rec.seconds, 3) + ' s into ' + rec.dir : (rec.error || '');
    if (rec.last) $('command').textContent = rec.last.command;
    if (!s.capturingOpen && $('region-note').textContent.indexOf('capturing the open level') === 0) note('');
    renderFitText(s);
    drawStrip(s.strip);
    drawFit(s.fit);
    if (s.picture.version !== pic.version) loadPicture(s.picture.version);
    drawPicture();
  }

  function renderMeters(meters) {
    var ul = $('meters');
    while (ul.firstChild) ul.removeChild(ul.firstChild);
    meters.forEach(function (m) {
      var li = document.createElement('li');
      li.className = m.verdict;
      li.setAttribute('data-meter', m.id);
      var title = document.createElement('strong');
      title.textContent = m.title + ': ';
      var value = document.createElement('span');
      value.className = 'value';
      value.textContent = m.value;
      var verdict = document.createElement('span');
      verdict.className = 'verdict';
      verdict.textContent = m.verdict;
      var advice = document.createElement('div');
      advice.textContent = m.advice + ' ';
      var link = document.createElement('a');
      link.href = '/guide' + q + '#' + encodeURIComponent(m.guideSection);
      link.textContent = 'guide';
      advice.appendChild(link);
      li.appendChild(title); li.appendChild(value); li.appendChild(verdict); li.appendChild(advice);
      ul.appendChild(li);
    });
  }

  function renderFitText(s) {
    var el = $('fit-text');
    if (s.fitEnabled) { el.textContent = 'No live fit: ' + s.fitEnabled + '.'; return; }
    var f = s.fit;
    if (!f) { el.textContent = 'waiting for data'; return; }
    if (f.status !== 'ok') { el.textContent = 'Waiting: ' + f.reason; return; }
    var b = f.kerrConstant;
    el.textContent = 'B = ' + fmt(b.value) + ' ± ' + fmt(b.stdErr, 2) + ' m/V² (σ ' + fmt(100 * f.relStdErrB, 2) + ' %) · V_π = ' + fmt(f.halfWaveVoltage.value / 1000) + ' ± ' + fmt(f.halfWaveVoltage.stdErr / 1000, 2) +
      ' kV · sync offset ' + fmt(f.offsetS) + ' s (R² ' + fmt(f.syncScore) + (f.syncAmbiguous ? ', ambiguous' : '') + ') · ' + f.points + ' frames · sweep reached ' + fmt(f.maxVoltageOverHalfWave, 2) + ' V_π' +
      (f.identifiable ? '' : ' · not yet well determined');
    el.setAttribute('data-b', String(b.value));
    el.setAttribute('data-sigma', String(b.stdErr));
  }

  // ---------------- picture ----------------
  var loading = false;
  function loadPicture(version) {
    if (loading) return;
    loading = true;
    fetch('/picture' + q).then(function (r) { return r.status === 200 ? r.arrayBuffer() : null; }).then(function (buf) {
      loading = false;
      if (!buf) return;
      var v = new DataView(buf);
      var w = v.getUint16(0, true), h = v.getUint16(2, true);
      var px = new Uint8Array(buf, 4);
      var canvas = $('picture');
      if (canvas.width !== w || canvas.height !== h) { canvas.width = w; canvas.height = h; }
      var img = new ImageData(w, h);
      for (var i = 0; i < w * h; i++) { var g = px[i]; img.data[4 * i] = g; img.data[4 * i + 1] = g; img.data[4 * i + 2] = g; img.data[4 * i + 3] = 255; }
      pic = { w: w, h: h, image: img, version: version };
      drawPicture();
    }).catch(function () { loading = false; });
  }

  function drawPicture() {
    var canvas = $('picture');
    var ctx = canvas.getContext('2d');
    if (pic.image) ctx.putImageData(pic.image, 0, 0);
    if (!state) return;
    var k = canvas.width / state.source.width;
    var box = function (r, colour, dash) {
      if (!r) return;
      ctx.save(); ctx.strokeStyle = colour; ctx.lineWidth = 1; ctx.setLineDash(dash || []);
      ctx.strokeRect(r.x * k + 0.5, r.y * k + 0.5, r.w * k - 1, r.h * k - 1); ctx.restore();
    };
    box(state.regions.surround, '#8b949e', [3, 2]);
    box(state.regions.dark, '#ff9d00');
    box(state.regions.reference, '#3fb950');
    box(state.regions.beam, '#00e5ff');
    if (drag && drag.now) {
      var r = dragRect(drag);
      box({ x: r.x, y: r.y, w: r.w, h: r.h }, '#ffffff', [4, 3]);
    }
  }

  /** Canvas (CSS pixels) to source pixels: round each corner, clamp to the frame. */
  function dragRect(d) {
    var canvas = $('picture');
    var rect = canvas.getBoundingClientRect();
    var sx = state.source.width / rect.width, sy = state.source.height / rect.height;
    var clampX = function (v) { return Math.max(0, Math.min(state.source.width, Math.round(v * sx))); };
    var clampY = function (v) { return Math.max(0, Math.min(state.source.height, Math.round(v * sy))); };
    var x0 = clampX(Math.min(d.x0, d.now.x)), x1 = clampX(Math.max(d.x0, d.now.x));
    var y0 = clampY(Math.min(d.y0, d.now.y)), y1 = clampY(Math.max(d.y0, d.now.y));
    return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
  }

  function mode() {
    var el = document.querySelector('input[name=mode]:checked');
    return el ? el.value : 'beam';
  }

  function at(ev) {
    var rect = $('picture').getBoundingClientRect();
    return { x: ev.clientX - rect.left, y: ev.clientY - rect.top };
  }

  function setupPicture() {
    var canvas = $('picture');
    canvas.addEventListener('mousedown', function (ev) { if (!state) return; var p = at(ev); drag = { x0: p.x, y0: p.y, now: p }; ev.preventDefault(); });
    window.addEventListener('mousemove', function (ev) { if (drag) { drag.now = at(ev); drawPicture(); } });
    window.addEventListener('mouseup', function (ev) {
      if (!drag) return;
      drag.now = at(ev);
      var r = dragRect(drag);
      drag = null;
      if (r.w < 2 || r.h < 2) { note('Drag a larger box (at least 2 pixels each way).'); return; }
      var kind = mode();
      post('/api/region', { kind: kind, rect: r }).then(function (j) { note(kind + ' region set: ' + j.text); }).catch(function (e) { note(e.message); });
    });
  }

  // ---------------- plots ----------------
  function axes(ctx, w, h, pad, xr, yr, xlabel, ylabel) {
    ctx.clearRect(0, 0, w, h);
    ctx.fillStyle = '#fff'; ctx.fillRect(0, 0, w, h);
    ctx.strokeStyle = '#57606a'; ctx.lineWidth = 1;
    ctx.beginPath(); ctx.moveTo(pad.l, pad.t); ctx.lineTo(pad.l, h - pad.b); ctx.lineTo(w - pad.r, h - pad.b); ctx.stroke();
    ctx.fillStyle = '#1f2328'; ctx.font = '12px system-ui, sans-serif';
    ctx.fillText(fmt(yr[1]), 4, pad.t + 10); ctx.fillText(fmt(yr[0]), 4, h - pad.b);
    ctx.fillText(fmt(xr[0]), pad.l, h - pad.b + 16); var t = fmt(xr[1]); ctx.fillText(t, w - pad.r - ctx.measureText(t).width, h - pad.b + 16);
    ctx.fillText(xlabel, (w - ctx.measureText(xlabel).width) / 2, h - 4);
    ctx.save(); ctx.translate(12, h / 2 + 40); ctx.rotate(-Math.PI / 2); ctx.fillText(ylabel, 0, 0); ctx.restore();
  }

  function range(values, fallback) {
    var lo = Infinity, hi = -Infinity;
    values.forEach(function (v) { if (v !== null && isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); } });
    if (!isFinite(lo)) return fallback;
    if (hi - lo < 1e-9) { hi = lo + 1e-3; }
    var m = 0.05 * (hi - lo);
    return [lo - m, hi + m];
  }

  function drawStrip(strip) {
    var canvas = $('strip'), ctx = canvas.getContext('2d');
    var w = canvas.width, h = canvas.height, pad = { l: 56, r: 10, t: 10, b: 34 };
    var yr = range(strip.i, [0, 1]);
    axes(ctx, w, h, pad, [-60, 0], yr, 'seconds before now', 'beam − surround');
    ctx.strokeStyle = '#0969da'; ctx.lineWidth = 1.5; ctx.beginPath();
    for (var k = 0; k < strip.t.length; k++) {
      var x = pad.l + (strip.t[k] + 60) / 60 * (w - pad.l - pad.r);
      var y = h - pad.b - (strip.i[k] - yr[0]) / (yr[1] - yr[0]) * (h - pad.t - pad.b);
      if (k === 0) ctx.moveTo(x, y); else ctx.lineTo(x, y);
    }
    ctx.stroke();
    canvas.setAttribute('data-points', String(strip.t.length));
  }

  function drawFit(f) {
    var canvas = $('fit'), ctx = canvas.getContext('2d');
    var w = canvas.width, h = canvas.height, pad = { l: 56, r: 10, t: 10, b: 34 };
    if (!f || f.status !== 'ok') { axes(ctx, w, h, pad, [0, 1], [0, 1], 'voltage (kV)', 'beam − surround'); return; }
    var xs = f.plot.voltageV.map(function (v) { return v / 1000; });
    var xr = range(xs, [0, 1]), yr = range(f.plot.intensity.concat(f.curve.intensity), [0, 1]);
    axes(ctx, w, h, pad, xr, yr, 'voltage (kV)', 'beam − surround');
    var X = function (v) { return pad.l + (v - xr[0]) / (xr[1] - xr[0]) * (w - pad.l - pad.r); };
    var Y = function (v) { return h - pad.b - (v - yr[0]) / (yr[1] - yr[0]) * (h - pad.t - pad.b); };
    ctx.fillStyle = 'rgba(9,105,218,0.55)';
    for (var k = 0; k < xs.length; k++) ctx.fillRect(X(xs[k]) - 1.5, Y(f.plot.intensity[k]) - 1.5, 3, 3);
    ctx.strokeStyle = '#cf222e'; ctx.lineWidth = 2; ctx.beginPath();
    for (var j = 0; j < f.curve.voltageV.length; j++) {
      var x = X(f.curve.voltageV[j] / 1000), y = Y(f.curve.intensity[j]);
      if (j === 0) ctx.moveTo(x, y); else ctx.lineTo(x, y);
    }
    ctx.stroke();
  }

  // ---------------- buttons ----------------
  function setupButtons() {
    $('capture-open').addEventListener('click', function () { post('/api/open').then(function () { note('capturing the open level for one second…'); }).catch(function (e) { note(e.message); }); });
    $('forget-open').addEventListener('click', function () { post('/api/open/clear').catch(function (e) { note(e.message); }); });
    $('clear-region').addEventListener('click', function () { post('/api/region/clear', { kind: mode() }).then(function () { note(mode() + ' region: automatic again'); }).catch(function (e) { note(e.message); }); });
    $('record').addEventListener('click', function () {
      var active = state && state.recording.active;
      $('record').disabled = true;
      post(active ? '/api/record/stop' : '/api/record/start').then(function (j) {
        $('record').disabled = false;
        if (j.command) $('command').textContent = j.command;
      }).catch(function (e) { $('record').disabled = false; $('record-status').textContent = e.message; });
    });
  }

  setupPicture();
  setupButtons();
  connect();
})();
`;
