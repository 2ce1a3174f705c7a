/**
 * The live server's rules, on a session that has not started a camera: the strict
 * Content-Security-Policy on every answer, the access token beyond loopback, the Host check on
 * loopback, buttons only with the page's own request header, and the guide served with the
 * anchors the meters link to.
 */
import { request } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LiveSession } from '../../src/live/liveSession.js';
import { CONTENT_SECURITY_POLICY, startLiveServer, type LiveServer } from '../../src/live/liveServer.js';
import { sourceSpec, type SourceInfo } from '../../src/live/liveSource.js';

const info: SourceInfo = {
  width: 320, height: 240, liveWidth: 320, liveHeight: 240, nominalFps: 30, pixelFormat: 'yuv420p', colourRange: 'limited',
  colourMatrix: 'bt709', colourTransfer: 'iec61966-2-1', codec: 'h264', durationS: null,
};

function session(): LiveSession {
  return new LiveSession({
    spec: sourceSpec('bench.mp4', { file: true }), info, voltsPath: null, lengthMm: null, gapMm: null, effectiveLengthMm: null,
    polariserAngleDeg: 45, roi: null, darkRoi: null, referenceRoi: null, outDir: 'unused', idleS: 30, say: () => undefined,
  });
}

function get(port: number, path: string, headers: Record<string, string> = {}, method = 'GET', body?: string): Promise<{ status: number; headers: Record<string, unknown>; body: string }> {
  return new Promise((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port, path, method, headers }, (res) => {
      let text = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => { text += c; });
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: text }));
    });
    req.on('error', reject);
    req.end(body);
  });
}

describe('live server', () => {
  let loop: LiveServer;
  let open: LiveServer;
  const token = 'a'.repeat(32);

  beforeAll(async () => {
    loop = await startLiveServer({ host: '127.0.0.1', port: 0, token: null, session: session() });
    // "beyond this computer" is simulated on loopback with a token
    open = await startLiveServer({ host: '127.0.0.1', port: 0, token, session: session() });
  });
  afterAll(async () => {
    await loop?.close();
    await open?.close();
  });

  it('serves the page, its script and styles with the strict policy, and nothing inline', async () => {
    for (const path of ['/', '/live.js', '/live.css', '/guide', '/state', '/nothing']) {
      const r = await get(loop.port, path);
      expect(r.headers['content-security-policy'], path).toBe(CONTENT_SECURITY_POLICY);
      expect(r.headers['x-content-type-options']).toBe('nosniff');
    }
    expect(CONTENT_SECURITY_POLICY).toContain("script-src 'self'");
    expect(CONTENT_SECURITY_POLICY).not.toMatch(/unsafe|https?:/);
    const page = (await get(loop.port, '/')).body;
    expect(page).toContain('<script src="/live.js" defer></script>');
    expect(page).not.toMatch(/<script>|style="|on(click|load)=/);
    expect(page).not.toMatch(/https?:\/\//);
    expect((await get(loop.port, '/live.js')).headers['content-type']).toMatch(/text\/javascript/);
  });

  it('serves the guide with the sections the meters link to', async () => {
    const guide = (await get(loop.port, '/guide')).body;
    for (const a of ['cross-polarisers', 'avoid-clipping', 'lock-exposure', 'frame-rate', 'voltage-log', 'safety']) expect(guide).toContain(`<a id="${a}"></a>`);
  });

  it('answers only requests that name this server on loopback', async () => {
    expect((await get(loop.port, '/state', { Host: 'evil.example:80' })).status).toBe(421);
    expect((await get(loop.port, '/state', { Host: `localhost:${loop.port}` })).status).toBe(200);
  });

  it('needs the access token on every request when one is set', async () => {
    expect((await get(open.port, '/')).status).toBe(403);
    expect((await get(open.port, '/state?t=wrong')).status).toBe(403);
    const ok = await get(open.port, `/?t=${token}`);
    expect(ok.status).toBe(200);
    expect(ok.body).toContain(`/live.js?t=${token}`);
    expect(open.url).toContain(`?t=${token}`);
  });

  it('takes button presses only with the page\'s request header, and checks drawn regions', async () => {
    const json = { 'Content-Type': 'application/json' };
    const body = JSON.stringify({ kind: 'beam', rect: { x: 10, y: 20, w: 30, h: 40 } });
    expect((await get(loop.port, '/api/region', json, 'POST', body)).status).toBe(403);
    const ok = await get(loop.port, '/api/region', { ...json, 'X-Kerrtrace': '1' }, 'POST', body);
    expect(ok.status).toBe(200);
    expect(JSON.parse(ok.body)).toEqual({ text: '--roi 10,20,30,40' });
    const outside = await get(loop.port, '/api/region', { ...json, 'X-Kerrtrace': '1' }, 'POST', JSON.stringify({ kind: 'beam', rect: { x: 300, y: 20, w: 30, h: 40 } }));
    expect(outside.status).toBe(400);
    expect(JSON.parse(outside.body).error).toMatch(/outside the 320x240 frame/);
    const state = JSON.parse((await get(loop.port, '/state')).body);
    expect(state.regions.roiText).toBe('--roi 10,20,30,40');
    expect(state.regions.beamHow).toBe('drawn');
    const notRecording = await get(loop.port, '/api/record/stop', { ...json, 'X-Kerrtrace': '1' }, 'POST', '{}');
    expect(JSON.parse(notRecording.body).error).toMatch(/not recording/);
  });
});
