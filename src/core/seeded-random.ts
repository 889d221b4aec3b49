/**
 * A seeded pseudo-random source: sfc32 (Chris Doty-Humphrey's Small Fast Counting generator),
 * seeded from a 32-bit integer through splitmix32. Returns uniform numbers in [0, 1).
 * Same seed, same sequence on every platform.
 */
export interface Rng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform integer in [0, n). */
  int(n: number): number;
  /** Standard normal (Box-Muller). */
  normal(): number;
}

function splitmix32(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

/** Creates a seeded generator; 'seed' must be a finite number (its low 32 bits are used). */
export function createRng(seed: number): Rng {
  if (!Number.isFinite(seed)) throw new TypeError(`'seed' must be a finite number; got ${seed}`);
  const init = splitmix32(Math.trunc(seed));
  let a = init();
  let b = init();
  let c = init();
  let d = init();
  const next = (): number => {
    a >>>= 0; b >>>= 0; c >>>= 0; d >>>= 0;
    const t = (((a + b) >>> 0) + d) >>> 0;
    d = (d + 1) >>> 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) >>> 0;
    c = (c << 21) | (c >>> 11);
    c = (c + t) >>> 0;
    return t / 4294967296;
  };
  for (let i = 0; i < 12; i++) next();
  let spare: number | undefined;
  return {
    next,
    int(n: number): number {
      if (!Number.isInteger(n) || n < 1) throw new RangeError(`'n' must be an integer >= 1; got ${n}`);
      return Math.floor(next() * n);
    },
    normal(): number {
      if (spare !== undefined) {
        const v = spare;
        spare = undefined;
        return v;
      }
      let u = 0;
      while (u === 0) u = next();
      const v = next();
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(2 * Math.PI * v);
      return r * Math.cos(2 * Math.PI * v);
    },
  };
}
