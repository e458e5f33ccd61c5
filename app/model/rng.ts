// Ziggurat tables for normals, 128 layers (Marsaglia & Tsang 2000, "The Ziggurat Method for
// Generating Random Variables", J. Stat. Software 5(8), function zigset).
const ZK = new Uint32Array(128);
const ZW = new Float64Array(128);
const ZF = new Float64Array(128);
const ZR = 3.442619855899;
{
  const m1 = 2147483648;
  const vn = 9.91256303526217e-3;
  let dn = ZR;
  let tn = dn;
  const q = vn / Math.exp(-0.5 * dn * dn);
  ZK[0] = (dn / q) * m1;
  ZK[1] = 0;
  ZW[0] = q / m1;
  ZW[127] = dn / m1;
  ZF[0] = 1;
  ZF[127] = Math.exp(-0.5 * dn * dn);
  for (let i = 126; i >= 1; i--) {
    dn = Math.sqrt(-2 * Math.log(vn / dn + Math.exp(-0.5 * dn * dn)));
    ZK[i + 1] = (dn / tn) * m1;
    tn = dn;
    ZF[i] = Math.exp(-0.5 * dn * dn);
    ZW[i] = dn / m1;
  }
}

/**
 * Seeded pseudo-random numbers: sfc32 (Doty-Humphrey's Small Fast Counting generator, from
 * PractRand) for uniforms and the ziggurat method for normals. The same seed gives the same
 * stream in Node, the browser and the worker (32-bit integer arithmetic only).
 */
export class Rng {
  // State words a, b, c and counter d, in a typed array so they stay unboxed 32-bit integers.
  private readonly s = new Int32Array(4);

  constructor(seed: number) {
    // splitmix32 spreads the seed over the state (common practice for seeding small generators).
    let x = seed >>> 0;
    const next = (): number => {
      x = (x + 0x9e3779b9) >>> 0;
      let z = x;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
      return z ^ (z >>> 16);
    };
    this.s[0] = next();
    this.s[1] = next();
    this.s[2] = next();
    this.s[3] = 1;
    for (let i = 0; i < 12; i++) this.int32();
  }

  /** Next 32 random bits as a signed integer. */
  int32(): number {
    const s = this.s;
    const a = s[0];
    const b = s[1];
    const c = s[2];
    const d = s[3];
    const t = (((a + b) | 0) + d) | 0;
    s[3] = d + 1;
    s[0] = b ^ (b >>> 9);
    s[1] = c + (c << 3);
    s[2] = ((c << 21) | (c >>> 11)) + t;
    return t;
  }

  /** Next 32-bit unsigned integer. */
  uint32(): number {
    return this.int32() >>> 0;
  }

  /** Uniform in the open interval (0, 1). */
  uniform(): number {
    return (this.uint32() + 0.5) / 4294967296;
  }

  /** Standard normal deviate (ziggurat; exact up to the 32-bit resolution of the uniforms). */
  normal(): number {
    // The layer takes the low 7 bits and the value the other 25, so the two are independent
    // (Doornik 2005, "An Improved Ziggurat Method to Generate Normal Random Samples").
    let r = this.int32();
    let iz = r & 127;
    let hz = r & ~127;
    if (Math.abs(hz) < ZK[iz]) return hz * ZW[iz];
    for (;;) {
      if (iz === 0) {
        let x: number;
        let y: number;
        do {
          x = -Math.log(this.uniform()) / ZR;
          y = -Math.log(this.uniform());
        } while (y + y < x * x);
        return hz > 0 ? ZR + x : -ZR - x;
      }
      const x = hz * ZW[iz];
      if (ZF[iz] + this.uniform() * (ZF[iz - 1] - ZF[iz]) < Math.exp(-0.5 * x * x)) return x;
      r = this.int32();
      iz = r & 127;
      hz = r & ~127;
      if (Math.abs(hz) < ZK[iz]) return hz * ZW[iz];
    }
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

/** 32-bit FNV-1a hash of a string, for stream labels that stay put when lists are reordered. */
export function hashLabel(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}
