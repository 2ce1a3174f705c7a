import { describe, expect, it } from 'vitest';
import { PassThrough } from 'node:stream';
import { makeProgress } from '../../cli/progress.js';

/** A writable that claims to be a terminal and records what is written. */
function fakeTerminal(isTTY: boolean): { stream: NodeJS.WriteStream; text: () => string } {
  const stream = new PassThrough() as unknown as NodeJS.WriteStream & { isTTY: boolean; columns: number };
  stream.isTTY = isTTY;
  stream.columns = 100;
  let written = '';
  (stream as unknown as PassThrough).on('data', (b: Buffer) => { written += b.toString('utf8'); });
  return { stream, text: () => written };
}

describe('makeProgress', () => {
  it('draws a bar with the label and counts on a terminal', async () => {
    const t = fakeTerminal(true);
    const p = makeProgress('tracing', false, t.stream);
    p.update(5, 10);
    p.stop();
    await new Promise((r) => setImmediate(r));
    expect(t.text()).toContain('tracing');
    expect(t.text()).toContain('5/10');
  });

  it('writes nothing when quiet', async () => {
    const t = fakeTerminal(true);
    const p = makeProgress('tracing', true, t.stream);
    p.update(5, 10);
    p.stop();
    await new Promise((r) => setImmediate(r));
    expect(t.text()).toBe('');
  });

  it('writes nothing when stderr is not a terminal (pipes, logs, tests)', async () => {
    const t = fakeTerminal(false);
    const p = makeProgress('tracing', false, t.stream);
    p.update(5, 10);
    p.stop();
    await new Promise((r) => setImmediate(r));
    expect(t.text()).toBe('');
  });
});
