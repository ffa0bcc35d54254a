/**
 * A small seeded pseudo-random generator (mulberry32, a public-domain 32-bit generator).
 * Math.random cannot be seeded; a seed makes every sample file reproducible byte for byte, so
 * committed files and their ground truth can be regenerated and checked.
 */
export type Rng = () => number;

export function mulberry32(seed: number): Rng {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Independent stream per purpose, so changing e.g. the GPS rate does not change the ride. */
export function rngStream(seed: number, stream: string): Rng {
  let h = 2166136261 ^ seed; // FNV-1a over the stream name, mixed with the seed
  for (let i = 0; i < stream.length; i++) h = Math.imul(h ^ stream.charCodeAt(i), 16777619);
  return mulberry32(h >>> 0);
}

/** Standard normal deviate (Box–Muller). */
export function gaussian(rng: Rng): number {
  const u = Math.max(rng(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
}
