/**
 * A seeded pseudo-random generator for Monte Carlo work in the core: xoshiro128** (32-bit words,
 * period 2^128 − 1), seeded from one integer through SplitMix64 as its authors recommend, so that a
 * stored seed reproduces a result on every host byte for byte.
 *
 *   result = rotl(s₁·5, 7)·9;  t = s₁ << 9;  s₂ ^= s₀; s₃ ^= s₁; s₁ ^= s₂; s₀ ^= s₃; s₂ ^= t;
 *   s₃ = rotl(s₃, 11)
 *
 * Sources: D. Blackman & S. Vigna, "Scrambled linear pseudorandom number generators", ACM TOMS
 * 47(4), 2021 (xoshiro128**); G. Steele, D. Lea & C. Flood, "Fast splittable pseudorandom number
 * generators", OOPSLA 2014 (SplitMix64).
 */
export const generatorName = 'xoshiro128** seeded by SplitMix64';

export interface Random {
  /** The next 32-bit output, as an unsigned integer. */
  nextUint32(): number;
  /** A uniform number in [0, 1) with 53 random bits. */
  nextUniform(): number;
}

const MASK64 = (1n << 64n) - 1n;

/** The SplitMix64 outputs that seed the generator's state (never all zero for any seed). */
export function splitMix64(seed: bigint, count: number): bigint[] {
  let state = seed & MASK64;
  const out: bigint[] = [];
  for (let i = 0; i < count; i++) {
    state = (state + 0x9e3779b97f4a7c15n) & MASK64;
    let z = state;
    z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & MASK64;
    z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & MASK64;
    out.push(z ^ (z >> 31n));
  }
  return out;
}

/**
 * The generator for a seed: a non-negative safe integer. The four state words are the low and high
 * halves of the first two SplitMix64 outputs.
 */
export function seededRandom(seed: number): Random {
  if (!Number.isSafeInteger(seed) || seed < 0)
    throw new RangeError(`a seed must be a non-negative whole number (got ${seed})`);
  const [first, second] = splitMix64(BigInt(seed), 2);
  const s = new Uint32Array([
    Number(first & 0xffffffffn),
    Number(first >> 32n),
    Number(second & 0xffffffffn),
    Number(second >> 32n),
  ]);
  const nextUint32 = (): number => {
    const result = Math.imul(rotl(Math.imul(s[1], 5), 7), 9) >>> 0;
    const t = s[1] << 9;
    s[2] ^= s[0];
    s[3] ^= s[1];
    s[1] ^= s[2];
    s[0] ^= s[3];
    s[2] ^= t;
    s[3] = rotl(s[3], 11);
    return result;
  };
  return {
    nextUint32,
    nextUniform: () => ((nextUint32() >>> 5) * 67108864 + (nextUint32() >>> 6)) / 9007199254740992,
  };
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}
