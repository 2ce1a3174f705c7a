/**
 * Follows a file that another program appends to (a voltage logger's CSV): checks its size every
 * `intervalMs`, reads only the new bytes, decodes them as UTF-8 (a character split across two
 * reads is kept whole) and hands the text to `onText`. A file that shrinks or is replaced (new
 * inode) starts over from its beginning (`onRestart` is called first); a missing file is waited
 * for. Edge module: file system and timers; `stop()` ends the polling.
 */
import { open, stat } from 'node:fs/promises';

export interface FollowHandlers {
  onText(text: string): void;
  onRestart(): void;
  /** Called with a short description when the file cannot be read (missing, a folder...), null when it can again. */
  onProblem(problem: string | null): void;
}

export interface FileFollow {
  stop(): void;
  /** Reads whatever is new now (also called by the timer). */
  poll(): Promise<void>;
}

export function followFile(path: string, handlers: FollowHandlers, intervalMs = 250): FileFollow {
  let offset = 0;
  let inode: number | null = null;
  let decoder = new TextDecoder('utf-8');
  let inflight: Promise<void> | null = null;
  let stopped = false;
  let lastProblem: string | null = 'not read yet';

  const problem = (p: string | null): void => {
    if (p !== lastProblem) handlers.onProblem(p);
    lastProblem = p;
  };

  const readNew = async (): Promise<void> => {
    try {
      let info;
      try {
        info = await stat(path);
      } catch (err) {
        const code = (err as NodeJS.ErrnoException).code;
        problem(code === 'ENOENT' ? `waiting for ${path} to appear: start the logger, or check the path` : `cannot read ${path} (${code ?? String(err)})`);
        return;
      }
      if (!info.isFile()) {
        problem(`${path} is not a file: give the logger's CSV file`);
        return;
      }
      if ((inode !== null && info.ino !== inode) || info.size < offset) {
        offset = 0;
        decoder = new TextDecoder('utf-8');
        handlers.onRestart();
      }
      inode = info.ino;
      problem(null);
      if (info.size === offset) return;
      const handle = await open(path, 'r');
      try {
        const length = Math.min(info.size - offset, 4 * 1024 * 1024);
        const buffer = Buffer.alloc(length);
        const { bytesRead } = await handle.read(buffer, 0, length, offset);
        offset += bytesRead;
        const text = decoder.decode(buffer.subarray(0, bytesRead), { stream: true });
        if (text.length > 0) handlers.onText(text);
      } finally {
        await handle.close();
      }
    } finally {
      inflight = null;
    }
  };
  /** One read at a time: a call while one runs waits for that one. */
  const poll = (): Promise<void> => {
    if (stopped) return Promise.resolve();
    inflight ??= readNew();
    return inflight;
  };

  const timer = setInterval(() => { void poll().catch((err: unknown) => problem(err instanceof Error ? err.message : String(err))); }, intervalMs);
  timer.unref();
  void poll().catch(() => undefined);
  return {
    stop() {
      stopped = true;
      clearInterval(timer);
    },
    poll,
  };
}
