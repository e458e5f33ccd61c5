/**
 * Seeded pseudo-random numbers: sfc32 (Doty-Humphrey's Small Fast Counting generator, from
 * PractRand) for uniforms and the Box–Muller transform for normals. The same seed gives the same
 * stream in Node, the browser and the worker (32-bit integer arithmetic only).
 */
export class Rng {
  private a: number;
  private b: number;
  private c: number;
  private d = 1;
  private spare = 0;
  private hasSpare = false;

  constructor(seed: number) {
    // splitmix32 spreads the seed over the state (common practice for seeding small generators).
    let s = seed >>> 0;
    const next = (): number => {
      s = (s + 0x9e3779b9) >>> 0;
      let z = s;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
      return (z ^ (z >>> 16)) >>> 0;
    };
    this.a = next();
    this.b = next();
    this.c = next();
    for (let i = 0; i < 12; i++) this.uint32();
  }

  /** Next 32-bit unsigned integer. */
  uint32(): number {
    const t = (((this.a + this.b) | 0) + this.d) | 0;
    this.d = (this.d + 1) | 0;
    this.a = this.b ^ (this.b >>> 9);
    this.b = (this.c + (this.c << 3)) | 0;
    this.c = (this.c << 21) | (this.c >>> 11);
    this.c = (this.c + t) | 0;
    return t >>> 0;
  }

  /** Uniform in the open interval (0, 1). */
  uniform(): number {
    return (this.uint32() + 0.5) / 4294967296;
  }

  /** Standard normal deviate. */
  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    const r = Math.sqrt(-2 * Math.log(this.uniform()));
    const th = 2 * Math.PI * this.uniform();
    this.spare = r * Math.sin(th);
    this.hasSpare = true;
    return r * Math.cos(th);
  }
}

/** Derives an independent stream seed from a plan seed and labels (e.g. site and variant index). */
export function streamSeed(seed: number, ...labels: number[]): number {
  let h = (seed ^ 0x5bd1e995) >>> 0;
  for (const l of labels) {
    h = Math.imul(h ^ (l + 0x27d4eb2f), 0x9e3779b1) >>> 0;
    h ^= h >>> 15;
  }
  return h >>> 0;
}
