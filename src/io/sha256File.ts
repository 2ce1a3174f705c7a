/**
 * SHA-256 of a file (FIPS 180-4, node:crypto), as lowercase hex. Read in 1 MiB pieces into one
 * reused buffer (a run's clip is hashed while it is decoded, so the reads should cost little CPU:
 * a stream's 64 KiB chunks, each a new buffer, cost about twice as much on a 200 MB clip).
 * @throws the file system's error when the file cannot be opened or read.
 * @example await sha256File('run.mp4') // 'e3b0c442…'
 */
import { createHash } from 'node:crypto';
import { open } from 'node:fs/promises';

const PIECE_BYTES = 1 << 20;

export async function sha256File(path: string): Promise<string> {
  const hash = createHash('sha256');
  const file = await open(path, 'r');
  try {
    const buffer = Buffer.allocUnsafe(PIECE_BYTES);
    for (;;) {
      const { bytesRead } = await file.read(buffer, 0, PIECE_BYTES, null);
      if (bytesRead === 0) break;
      hash.update(buffer.subarray(0, bytesRead));
    }
  } finally {
    await file.close();
  }
  return hash.digest('hex');
}
