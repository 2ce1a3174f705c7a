/** The live view's and the guide page's style sheet (served as /live.css). */
export const LIVE_PAGE_STYLES = `
:root { color-scheme: light; --good: #1a7f37; --fair: #9a6700; --poor: #cf222e; --unknown: #57606a; }
* { box-sizing: border-box; }
body { font: 15px/1.45 system-ui, sans-serif; margin: 0 auto; max-width: 1280px; padding: 0 16px 32px; color: #1f2328; background: #fff; }
header { display: flex; flex-wrap: wrap; gap: 4px 24px; align-items: baseline; }
h1 { font-size: 1.4em; margin: 12px 0 4px; }
h2 { font-size: 1.1em; margin: 14px 0 6px; }
.status { font-weight: 600; }
.status.down { color: var(--poor); }
.safety { background: #fff8c5; border: 1px solid #d4a72c; padding: 8px 12px; border-radius: 6px; }
main { display: grid; grid-template-columns: minmax(300px, 1fr) minmax(300px, 1fr); gap: 8px 24px; }
@media (max-width: 900px) { main { grid-template-columns: 1fr; } }
canvas { width: 100%; height: auto; border: 1px solid #d0d7de; background: #000; display: block; }
#strip, #fit { background: #fff; }
#picture { cursor: crosshair; image-rendering: pixelated; max-width: 640px; }
.controls { margin: 8px 0; }
fieldset { border: 1px solid #d0d7de; border-radius: 6px; }
button { font: inherit; padding: 4px 10px; margin: 2px 4px 2px 0; }
button.on { background: var(--poor); color: #fff; border-color: var(--poor); }
code { background: #f6f8fa; padding: 1px 4px; border-radius: 4px; word-break: break-all; }
.note { color: #57606a; font-size: 0.92em; }
.meters { list-style: none; padding: 0; margin: 0; }
.meters li { border-left: 6px solid var(--unknown); padding: 4px 10px; margin: 6px 0; background: #f6f8fa; }
.meters li.good { border-color: var(--good); }
.meters li.fair { border-color: var(--fair); }
.meters li.poor { border-color: var(--poor); }
.meters .verdict { font-weight: 700; text-transform: uppercase; font-size: 0.8em; margin-left: 6px; }
.meters li.good .verdict { color: var(--good); }
.meters li.fair .verdict { color: var(--fair); }
.meters li.poor .verdict { color: var(--poor); }
.meters .value { font-variant-numeric: tabular-nums; }
.key { padding: 0 6px; border-left: 14px solid; margin-right: 8px; }
.key.beam { border-color: #00e5ff; }
.key.surround { border-color: #8b949e; }
.key.dark { border-color: #ff9d00; }
.key.reference { border-color: #3fb950; }
footer { margin-top: 24px; color: #57606a; font-size: 0.9em; }
body.guide main { display: block; max-width: 760px; }
`;
