/**
 * The live view's web server (Node's built-in http, nothing else): the page, its script and
 * styles, the guide, the state as Server-Sent Events (4 per second, with a retry hint so the page
 * reconnects by itself when the server comes back), the latest picture, and the page's buttons.
 *
 * Safety of a local server:
 * - listens on 127.0.0.1 unless another address is asked for; then every request must carry the
 *   random access token (`?t=…`) printed with the address;
 * - on loopback the Host header must name this server (no DNS rebinding); the buttons are POSTs that need a
 *   custom header (a page elsewhere cannot send it without a preflight this server never grants);
 * - every answer carries a strict Content-Security-Policy: scripts, styles, images and
 *   connections from this server only, no inline script, no frames, no forms, no plugins.
 * Nothing the page loads comes from outside the machine.
 * Edge module.
 */
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { isKerrError } from '../errors.js';
import { packageInfo } from '../report/packageInfo.js';
import { GUIDE_FILE } from '../report/guide.js';
import type { Rect } from '../media/types.js';
import type { LiveSession, RegionKind } from './liveSession.js';
import { guideHtml } from './guideHtml.js';
import { livePageHtml } from './page/livePageHtml.js';
import { LIVE_PAGE_SCRIPT } from './page/livePageScript.js';
import { LIVE_PAGE_STYLES } from './page/livePageStyles.js';

export const CONTENT_SECURITY_POLICY =
  "default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self'; connect-src 'self'; font-src 'none'; object-src 'none'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";

export interface LiveServerOptions {
  host: string;
  port: number;
  /** Required on every request when not null. */
  token: string | null;
  session: LiveSession;
}

export interface LiveServer {
  url: string;
  port: number;
  close(): Promise<void>;
}

const JSON_LIMIT = 16 * 1024;

function baseHeaders(type: string): Record<string, string> {
  return {
    'Content-Type': type,
    'Content-Security-Policy': CONTENT_SECURITY_POLICY,
    'X-Content-Type-Options': 'nosniff',
    'Referrer-Policy': 'no-referrer',
    'Cross-Origin-Resource-Policy': 'same-origin',
    'Cache-Control': 'no-store',
  };
}

function send(res: ServerResponse, status: number, type: string, body: string | Buffer): void {
  res.writeHead(status, baseHeaders(type));
  res.end(body);
}

function sendJson(res: ServerResponse, status: number, value: unknown): void {
  send(res, status, 'application/json; charset=utf-8', JSON.stringify(value, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v)));
}

async function readJson(req: IncomingMessage): Promise<Record<string, unknown>> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const c of req) {
    size += (c as Buffer).length;
    if (size > JSON_LIMIT) throw new Error('request body too large');
    chunks.push(c as Buffer);
  }
  if (size === 0) return {};
  const v = JSON.parse(Buffer.concat(chunks).toString('utf8')) as unknown;
  if (typeof v !== 'object' || v === null || Array.isArray(v)) throw new Error('expected a JSON object');
  return v as Record<string, unknown>;
}

function regionKind(v: unknown): RegionKind {
  if (v === 'beam' || v === 'dark' || v === 'reference') return v;
  throw new Error('kind must be beam, dark or reference');
}

function rectFrom(v: unknown): Rect {
  const r = v as Partial<Rect> | null;
  if (!r || ![r.x, r.y, r.w, r.h].every((n) => typeof n === 'number' && Number.isInteger(n))) throw new Error('rect must be {x, y, w, h} in whole pixels');
  return { x: r.x!, y: r.y!, w: r.w!, h: r.h! };
}

export async function startLiveServer(o: LiveServerOptions): Promise<LiveServer> {
  const { session } = o;
  const streams = new Set<ServerResponse>();
  let guide: string | null = null;
  const loadGuide = (): string => {
    if (guide !== null) return guide;
    const root = packageInfo().root;
    let md = '# Recording a run kerrtrace can measure well\n\nThe guide (docs/recording-a-run.md) was not found beside this installation.';
    try {
      if (root !== null) md = readFileSync(join(root, GUIDE_FILE), 'utf8');
    } catch {
      // keep the note
    }
    guide = guideHtml(md, `/live.css${o.token ? `?t=${o.token}` : ''}`);
    return guide;
  };
  let port = o.port;
  const allowedHosts = (): Set<string> => new Set([`127.0.0.1:${port}`, `localhost:${port}`, `[::1]:${port}`, `${o.host}:${port}`, o.host.includes(':') ? `[${o.host}]:${port}` : '']);

  const server = createServer((req, res) => {
    void handle(req, res).catch((err: unknown) => {
      if (!res.headersSent) sendJson(res, 500, { error: err instanceof Error ? err.message : String(err) });
      else res.end();
    });
  });

  async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
    // On loopback the Host header must name this server (a page elsewhere cannot rebind a name to
    // 127.0.0.1 and read it); served beyond this computer, the secret token does that job.
    if (o.token === null && !allowedHosts().has(String(req.headers.host ?? ''))) return send(res, 421, 'text/plain; charset=utf-8', 'wrong host\n');
    const url = new URL(req.url ?? '/', `http://127.0.0.1:${port}`);
    if (o.token !== null && url.searchParams.get('t') !== o.token) return send(res, 403, 'text/plain; charset=utf-8', 'this page needs the access token printed by kerrtrace watch\n');
    const method = req.method ?? 'GET';
    if (method === 'GET') {
      switch (url.pathname) {
        case '/': return send(res, 200, 'text/html; charset=utf-8', livePageHtml(o.token));
        case '/live.js': return send(res, 200, 'text/javascript; charset=utf-8', LIVE_PAGE_SCRIPT);
        case '/live.css': return send(res, 200, 'text/css; charset=utf-8', LIVE_PAGE_STYLES);
        case '/guide': return send(res, 200, 'text/html; charset=utf-8', loadGuide());
        case '/favicon.ico': res.writeHead(204, baseHeaders('image/x-icon')); res.end(); return;
        case '/state': return sendJson(res, 200, session.snapshot());
        case '/picture': {
          const p = session.picture();
          if (!p) { res.writeHead(204, baseHeaders('application/octet-stream')); res.end(); return; }
          return send(res, 200, 'application/octet-stream', p);
        }
        case '/events': {
          res.writeHead(200, { ...baseHeaders('text/event-stream; charset=utf-8'), Connection: 'keep-alive' });
          res.write('retry: 1000\n\n');
          streams.add(res);
          session.setClients(streams.size);
          req.on('close', () => {
            streams.delete(res);
            session.setClients(streams.size);
          });
          return;
        }
        default: return send(res, 404, 'text/plain; charset=utf-8', 'not found\n');
      }
    }
    if (method !== 'POST') return send(res, 405, 'text/plain; charset=utf-8', 'method not allowed\n');
    if (req.headers['x-kerrtrace'] !== '1') return send(res, 403, 'text/plain; charset=utf-8', 'missing request header\n');
    let body: Record<string, unknown>;
    try {
      body = await readJson(req);
    } catch (err) {
      return sendJson(res, 400, { error: err instanceof Error ? err.message : String(err) });
    }
    try {
      switch (url.pathname) {
        case '/api/region': return sendJson(res, 200, { text: session.setRegion(regionKind(body.kind), rectFrom(body.rect), 'drawn') });
        case '/api/region/clear': session.clearRegion(regionKind(body.kind)); return sendJson(res, 200, {});
        case '/api/open': session.captureOpen(); return sendJson(res, 200, {});
        case '/api/open/clear': session.clearOpen(); return sendJson(res, 200, {});
        case '/api/record/start': return sendJson(res, 200, await session.startRecording());
        case '/api/record/stop': return sendJson(res, 200, await session.stopRecording());
        default: return send(res, 404, 'text/plain; charset=utf-8', 'not found\n');
      }
    } catch (err) {
      return sendJson(res, 400, { error: isKerrError(err) ? err.oneLine() : err instanceof Error ? err.message : String(err) });
    }
  }

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(o.port, o.host, () => resolve());
  });
  port = (server.address() as AddressInfo).port;
  const timer = setInterval(() => {
    if (streams.size === 0) return;
    const data = `data: ${JSON.stringify(session.snapshot(), (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v))}\n\n`;
    for (const s of streams) s.write(data);
  }, 250);
  const shownHost = o.host.includes(':') ? `[${o.host}]` : o.host;
  return {
    url: `http://${shownHost}:${port}/${o.token ? `?t=${o.token}` : ''}`,
    port,
    async close() {
      clearInterval(timer);
      for (const s of streams) s.end();
      streams.clear();
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      await closed;
    },
  };
}
