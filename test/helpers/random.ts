/**
 * Seeded pseudo-random numbers for reproducible synthetic data in tests: mulberry32 (a common
 * 32-bit generator, common practice) and Box–Muller normal deviates (Box & Muller, Ann. Math.
 * Stat. 1958).
 */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function seededNormal(seed: number): () => number {
  const uniform = seededRandom(seed);
  return () => {
    const u1 = Math.max(uniform(), 1e-300);
    const u2 = uniform();
    return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
  };
}
