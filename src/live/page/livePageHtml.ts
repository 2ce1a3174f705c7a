/**
 * The live view's HTML: structure only. Behaviour comes from /live.js and looks from /live.css,
 * both served by the tool itself (the Content-Security-Policy allows nothing inline and nothing
 * from elsewhere). The access token, when one is needed, is carried in a data attribute.
 */
import { escapeHtml } from '../../report/escapeHtml.js';

export function livePageHtml(token: string | null): string {
  const q = token ? `?t=${encodeURIComponent(token)}` : '';
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>kerrtrace: live view</title>
<link rel="stylesheet" href="/live.css${escapeHtml(q)}">
<script src="/live.js${escapeHtml(q)}" defer></script>
</head>
<body data-token="${escapeHtml(token ?? '')}">
<header>
  <h1>kerrtrace live view</h1>
  <p id="source">connecting…</p>
  <p id="connection" class="status">connecting…</p>
</header>
<section id="safety" class="safety" aria-label="Safety">
  <strong>High voltage.</strong> The cell runs at kilovolts: switch the supply off and discharge the cell before
  you touch the electrodes, leads or liquid; keep one hand away from the bench while it is on.
  <strong>Laser.</strong> Never look into the beam or its reflections; wear eye protection for the wavelength and
  power you use, and keep the beam below eye level. Many Kerr liquids are toxic: handle them as their safety data sheet says.
  <a href="/guide${escapeHtml(q)}#safety">More in the guide</a>.
</section>
<main>
  <section class="picture-panel" aria-label="Picture">
    <canvas id="picture" width="320" height="240" aria-label="Live picture with the regions"></canvas>
    <div class="controls">
      <fieldset>
        <legend>Drag on the picture to draw</legend>
        <label><input type="radio" name="mode" value="beam" checked> beam</label>
        <label><input type="radio" name="mode" value="dark"> dark</label>
        <label><input type="radio" name="mode" value="reference"> reference</label>
        <button type="button" id="clear-region">Back to automatic</button>
      </fieldset>
      <p>Beam region for analyze: <code id="roi">none yet</code> <span id="roi-how"></span></p>
      <p id="region-note" class="note"></p>
      <p class="legend"><span class="key beam">beam</span> <span class="key surround">surround</span> <span class="key dark">dark</span> <span class="key reference">reference</span></p>
    </div>
    <div class="controls">
      <button type="button" id="capture-open">Capture open level</button>
      <button type="button" id="forget-open">Forget open level</button>
      <span id="open-level" class="note"></span>
      <p class="note">Turn the analyser parallel with the field off, then press: the beam is averaged for one second.</p>
    </div>
    <div class="controls recording">
      <button type="button" id="record">Start recording</button>
      <span id="record-status"></span>
      <p>Measure the last recording with: <code id="command">none yet</code></p>
    </div>
  </section>
  <section aria-label="Meters">
    <h2>Will this run measure well?</h2>
    <ul id="meters" class="meters"></ul>
  </section>
  <section aria-label="Beam intensity">
    <h2>Beam intensity, last minute</h2>
    <canvas id="strip" width="640" height="180" aria-label="Beam intensity over the last minute"></canvas>
  </section>
  <section aria-label="Kerr fit">
    <h2>Intensity against voltage</h2>
    <p id="fit-text">waiting for data</p>
    <canvas id="fit" width="640" height="260" aria-label="Intensity against voltage with the running Kerr fit"></canvas>
  </section>
</main>
<footer><a href="/guide${escapeHtml(q)}">Recording a run kerrtrace can measure well</a> · served by kerrtrace from this computer; nothing is loaded from elsewhere.</footer>
</body>
</html>
`;
}
