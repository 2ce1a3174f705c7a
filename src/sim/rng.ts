/**
 * A small seeded, splittable pseudo-random generator for the bench simulator: xoshiro128**
 * (Blackman & Vigna, "Scrambled linear pseudorandom number generators", 2018) seeded through
 * splitmix32-style mixing (MurmurHash3's fmix32 finaliser). Written here so that the same seed
 * gives the same numbers on every machine and Node version.
 *
 * `split(label, index)` derives an independent child stream from this stream's key, a label and an
 * index, without consuming numbers from the parent: the noise of frame 17 is `root.split('frame',
 * 17)`, so changing how many numbers one part draws never shifts another part.
 *
 * Normal deviates come from a 65 536-entry table of standard-normal quantiles at the midpoints
 * (i + 0.5)/65536 (inverse CDF by Acklam's rational approximation, relative error < 1.2e-9),
 * rescaled to unit variance; tails are cut at about ±4.3σ. That is ample for camera noise.
 *
 * Throws nothing. Example: `makeRng(7).uniform()` is the same number on every run.
 */

/** MurmurHash3 fmix32: a bijective 32-bit mixer. */
export function mix32(x: number): number {
  let h = x >>> 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** FNV-1a 32-bit hash of a short label. */
function hashLabel(label: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < label.length; i++) {
    h ^= label.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** Folds any safe integer seed into 32 bits. */
function foldSeed(seed: number): number {
  const lo = seed % 0x100000000 >>> 0;
  const hi = Math.floor(seed / 0x100000000) >>> 0;
  return (lo ^ mix32(hi + 0x9e3779b9)) >>> 0;
}

/** Acklam's inverse standard-normal CDF, 0 < p < 1. */
function inverseNormalCdf(p: number): number {
  const a = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
  const b = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
  const c = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
  const low = 0.02425;
  if (p < low) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (((((c[0]! * q + c[1]!) * q + c[2]!) * q + c[3]!) * q + c[4]!) * q + c[5]!) / ((((d[0]! * q + d[1]!) * q + d[2]!) * q + d[3]!) * q + 1);
  }
  if (p > 1 - low) return -inverseNormalCdf(1 - p);
  const q = p - 0.5;
  const r = q * q;
  return ((((((a[0]! * r + a[1]!) * r + a[2]!) * r + a[3]!) * r + a[4]!) * r + a[5]!) * q) /
    (((((b[0]! * r + b[1]!) * r + b[2]!) * r + b[3]!) * r + b[4]!) * r + 1);
}

function buildNormalTable(): Float32Array {
  const n = 65536;
  const raw = new Float64Array(n);
  let sumSq = 0;
  for (let i = 0; i < n; i++) {
    const z = inverseNormalCdf((i + 0.5) / n);
    raw[i] = z;
    sumSq += z * z;
  }
  const scale = 1 / Math.sqrt(sumSq / n); // symmetric table: mean is exactly 0
  const table = new Float32Array(n);
  for (let i = 0; i < n; i++) table[i] = raw[i]! * scale;
  return table;
}

/** 65 536 standard-normal deviates indexed by 16 random bits (see the file comment). */
export const NORMAL_TABLE: Float32Array = buildNormalTable();

export class Rng {
  /** The 32-bit key this stream was derived from (used to split children). */
  readonly key: number;
  /** xoshiro128** state as int32 words (a typed array keeps them unboxed). */
  private readonly s: Int32Array;

  constructor(key: number) {
    this.key = key >>> 0;
    let x = this.key;
    const next = (): number => {
      x = (x + 0x9e3779b9) >>> 0;
      return mix32(x);
    };
    this.s = Int32Array.of(next(), next(), next(), next());
    if ((this.s[0]! | this.s[1]! | this.s[2]! | this.s[3]!) === 0) this.s[0] = 1; // the all-zero state is forbidden
  }

  /** Next 32 random bits as a signed int32 (xoshiro128**); the fast path for bulk noise. */
  nextInt32(): number {
    const s = this.s;
    const s0 = s[0]!;
    const s1 = s[1]!;
    let s2 = s[2]!;
    let s3 = s[3]!;
    const m = Math.imul(s1, 5);
    const result = Math.imul((m << 7) | (m >>> 25), 9);
    const t = s1 << 9;
    s2 ^= s0;
    s3 ^= s1;
    s[1] = s1 ^ s2;
    s[0] = s0 ^ s3;
    s[2] = s2 ^ t;
    s[3] = (s3 << 11) | (s3 >>> 21);
    return result;
  }

  /** Next uniform 32-bit unsigned integer. */
  nextU32(): number {
    return this.nextInt32() >>> 0;
  }

  /** Uniform in [0, 1) with 32 bits of resolution. */
  uniform(): number {
    return (this.nextInt32() >>> 0) / 0x100000000;
  }

  /** Uniform in [lo, hi). */
  between(lo: number, hi: number): number {
    return lo + (hi - lo) * this.uniform();
  }

  /** Uniform integer in [lo, hi] (inclusive). */
  integer(lo: number, hi: number): number {
    return lo + Math.min(hi - lo, Math.floor(this.uniform() * (hi - lo + 1)));
  }

  /** One standard-normal deviate from the quantile table. */
  normal(): number {
    return NORMAL_TABLE[this.nextInt32() >>> 16]!;
  }

  /** An independent child stream for (label, index); does not advance this stream. */
  split(label: string, index = 0): Rng {
    const k1 = mix32((this.key ^ Math.imul(hashLabel(label), 0x9e3779b1)) >>> 0);
    return new Rng(mix32((k1 + Math.imul(index >>> 0, 0x85ebca6b) + 0x27d4eb2f) >>> 0));
  }
}

/** The root stream of a scenario seed (any safe integer). @example makeRng(1).split('frame', 0) */
export function makeRng(seed: number): Rng {
  return new Rng(foldSeed(Math.trunc(seed)));
}
