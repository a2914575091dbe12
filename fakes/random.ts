// Deterministic randomness for the simulated hardware: the same seed gives the same
// weather, the same meter jitter and the same sensor noise on every run.

/** A 32-bit integer hash of the seed and a key (splitmix32-style finaliser). */
export function hash32(seed: number, key: number) {
  let h = (Math.imul(seed | 0, 0x9e3779b1) ^ Math.imul(key | 0, 0x85ebca77)) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x21f0aaad);
  h = Math.imul(h ^ (h >>> 15), 0x735a2d97);
  return (h ^ (h >>> 15)) >>> 0;
}

/** A uniform number in [0, 1) fixed by the seed and key. */
export function unit(seed: number, key: number) {
  return hash32(seed, key) / 4294967296;
}

/**
 * Smooth noise in [-1, 1] along a time axis: random knots every `periodMs`, joined by
 * a cosine ease. A pure function of time, so it does not depend on how often it is read.
 */
export function smoothNoise(seed: number, tMs: number, periodMs: number) {
  const x = tMs / periodMs;
  const i = Math.floor(x);
  const f = x - i;
  const a = unit(seed, i) * 2 - 1;
  const b = unit(seed, i + 1) * 2 - 1;
  const w = (1 - Math.cos(Math.PI * f)) / 2;
  return a + (b - a) * w;
}

/** A seeded sequence (mulberry32) for values drawn one after another. */
export function sequence(seed: number) {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A number seed from a name, so each device gets its own stream. */
export function seedFrom(text: string, base = 0) {
  let h = base >>> 0;
  for (let i = 0; i < text.length; i++) h = hash32(h, text.charCodeAt(i));
  return h;
}
