// Small deterministic random sources for the demo scenario. Math.random
// cannot be seeded, and the demo must come out identical on every machine
// and every run, so the scenario carries its own generator.

/**
 * mulberry32: a 32-bit state generator (public-domain, widely used for
 * seeded tests and demos; not for cryptography). Returns numbers in [0, 1).
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** 32-bit FNV-1a hash of a string, to seed one stream per meter or topic. */
export function hashSeed(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

export type Random = () => number;

/** A stream seeded from a name: the same name always gives the same stream. */
export function streamFor(name: string): Random {
  return mulberry32(hashSeed(`larchmere:${name}`));
}

/** Standard normal deviate by the Box–Muller transform. */
export function gaussian(rand: Random): number {
  // 1 − u is in (0, 1], so the logarithm is finite.
  const u = 1 - rand();
  const v = rand();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

/** 1 + σ·N(0, 1), floored at 0: multiplicative noise on an energy. */
export function noiseFactor(rand: Random, sigma: number): number {
  return Math.max(0, 1 + sigma * gaussian(rand));
}
