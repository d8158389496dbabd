/**
 * Seeded pseudo-random numbers for the tracer (DESIGN §3 "Determinism"; STYLE §8: random numbers
 * are passed in, never drawn inside a sampler).
 *
 * Generator: xoshiro128** (Blackman & Vigna), 128 bits of state in a caller-owned `Uint32Array(4)`,
 * period 2^128 − 1. Streams: the state for stream `stream` (a receiver index) under `seed` is set by
 * hashing (seed, stream, substream) through a 32-bit integer finaliser and expanding it with a
 * splitmix-style Weyl sequence. So the numbers a receiver draws depend only on the seed and the
 * receiver's index — never on how the receivers were split into chunks or workers.
 *
 * References:
 * [1] D. Blackman and S. Vigna, "Scrambled linear pseudorandom number generators,"
 *     ACM Trans. Math. Softw., vol. 47, no. 4, art. 36, 2021, doi:10.1145/3460772.
 * [2] G. L. Steele, D. Lea and C. H. Flood, "Fast splittable pseudorandom number generators,"
 *     OOPSLA 2014, doi:10.1145/2660193.2660195 (the splitmix Weyl-sequence seeding).
 */

/** Words of generator state. */
export const RANDOM_STATE_WORDS = 4;

/** The default seed when a project gives none. */
export const DEFAULT_SEED = 0x5f3759df;

/** A fresh (zeroed, invalid until seeded) generator state. Allocate once, re-seed per stream. */
export function createRandomState(): Uint32Array {
  return new Uint32Array(RANDOM_STATE_WORDS);
}

/**
 * 32-bit integer finaliser (a "lowbias32"-style xorshift-multiply hash): a bijection on uint32
 * with good avalanche, used to decorrelate neighbouring seeds and stream ids.
 */
export function hash32(x: number): number {
  let z = x >>> 0;
  z = Math.imul(z ^ (z >>> 16), 0x21f0aaad);
  z = Math.imul(z ^ (z >>> 15), 0x735a2d97);
  return (z ^ (z >>> 15)) >>> 0;
}

/**
 * Seeds `state` for stream `stream` (e.g. a receiver index) of generator `seed`. Allocation-free.
 * @param state Generator state, `Uint32Array(4)` [-]
 * @param seed Project seed, any integer (taken mod 2^32) [-]
 * @param stream Stream id, an integer in [0, 2^32) [-]
 * @param substream Optional second id (e.g. a query kind), so two queries never share numbers [-]
 */
export function seedRandom(state: Uint32Array, seed: number, stream: number, substream = 0): void {
  let s = hash32(hash32(hash32(seed >>> 0) ^ (stream >>> 0)) + Math.imul(substream >>> 0, 0x9e3779b9));
  let any = 0;
  for (let w = 0; w < RANDOM_STATE_WORDS; w++) {
    s = (s + 0x9e3779b9) >>> 0;
    const v = hash32(s);
    state[w] = v;
    any |= v;
  }
  // xoshiro must not start from the all-zero state.
  if (any === 0) state[0] = 1;
}

/** Next 32-bit unsigned integer of the stream (xoshiro128**). */
export function nextUint32(state: Uint32Array): number {
  const s0 = state[0]!;
  const s1 = state[1]!;
  const s2 = state[2]!;
  const s3 = state[3]!;
  const m = Math.imul(s1, 5);
  const result = Math.imul((m << 7) | (m >>> 25), 9) >>> 0;
  const t = s1 << 9;
  const n2 = s2 ^ s0;
  const n3 = s3 ^ s1;
  state[1] = s1 ^ n2;
  state[0] = s0 ^ n3;
  state[2] = n2 ^ t;
  state[3] = (n3 << 11) | (n3 >>> 21);
  return result;
}

/** Next number uniform in [0, 1) with 32 random bits. */
export function nextFloat(state: Uint32Array): number {
  return nextUint32(state) * 2.3283064365386963e-10;
}
