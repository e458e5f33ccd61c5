/**
 * A small reader of Mapbox Vector Tiles (the open MVT specification, version 2.1: a protocol
 * buffer `Tile` of `Layer`s of `Feature`s, geometry as MoveTo/LineTo/ClosePath commands with
 * zigzag-encoded deltas). It keeps only what the base map draws (layer names, feature types and
 * geometry; no tags) and is bounded against hostile tiles: a tile's bytes, features and points
 * are capped, and anything malformed throws.
 */

/** A feature's geometry: 1 point, 2 line, 3 polygon; each part a flat [x0, y0, x1, y1, …]. */
export interface MvtFeature {
  type: number;
  parts: number[][];
}

/** One layer: its name, its extent (tile width in its coordinates) and its features. */
export interface MvtLayer {
  name: string;
  extent: number;
  features: MvtFeature[];
}

/** Most of each thing read from one tile (beyond: the tile is refused). */
export const MVT_LIMITS = { bytes: 4e6, features: 50_000, points: 2e6 };

class Reader {
  pos = 0;
  constructor(
    readonly buf: Uint8Array,
    readonly end = buf.length,
  ) {}

  varint(): number {
    let v = 0;
    let mul = 1;
    for (let i = 0; i < 10; i++) {
      if (this.pos >= this.end) throw new Error('vector tile: truncated number');
      const b = this.buf[this.pos++];
      v += (b & 0x7f) * mul;
      if (b < 0x80) return v;
      mul *= 128;
    }
    throw new Error('vector tile: number longer than 10 bytes');
  }

  /** The bounds of a length-delimited field's bytes. */
  sub(): [number, number] {
    const len = this.varint();
    const start = this.pos;
    if (start + len > this.end) throw new Error('vector tile: field runs past its message');
    this.pos += len;
    return [start, start + len];
  }

  skip(wire: number): void {
    if (wire === 0) this.varint();
    else if (wire === 1) this.pos += 8;
    else if (wire === 2) this.sub();
    else if (wire === 5) this.pos += 4;
    else throw new Error(`vector tile: unknown wire type ${wire}`);
    if (this.pos > this.end) throw new Error('vector tile: truncated field');
  }
}

const zigzag = (n: number): number => (n % 2 === 1 ? -(n + 1) / 2 : n / 2);

/** Decodes a feature's geometry commands into parts (rings or lines or points). */
function geometry(r: Reader, start: number, end: number, budget: { points: number }): number[][] {
  const g = new Reader(r.buf, end);
  g.pos = start;
  const parts: number[][] = [];
  let cur: number[] | null = null;
  let x = 0;
  let y = 0;
  while (g.pos < end) {
    const cmd = g.varint();
    const id = cmd & 7;
    const count = Math.floor(cmd / 8);
    if (id === 7) {
      if (cur && cur.length >= 2) cur.push(cur[0], cur[1]);
      continue;
    }
    if (id !== 1 && id !== 2) throw new Error(`vector tile: unknown geometry command ${id}`);
    budget.points -= count;
    if (budget.points < 0) throw new Error('vector tile: too many points');
    for (let i = 0; i < count; i++) {
      x += zigzag(g.varint());
      y += zigzag(g.varint());
      if (id === 1) {
        cur = [x, y];
        parts.push(cur);
      } else {
        if (!cur) throw new Error('vector tile: a line starts without a move');
        cur.push(x, y);
      }
    }
  }
  return parts;
}

function feature(r: Reader, start: number, end: number, budget: { points: number }): MvtFeature {
  r.pos = start;
  let type = 0;
  let parts: number[][] = [];
  while (r.pos < end) {
    const key = r.varint();
    const field = Math.floor(key / 8);
    const wire = key & 7;
    if (field === 3 && wire === 0) type = r.varint();
    else if (field === 4 && wire === 2) {
      const [s, e] = r.sub();
      parts = geometry(r, s, e, budget);
    } else r.skip(wire);
  }
  return { type, parts };
}

function layer(
  r: Reader,
  start: number,
  end: number,
  budget: { points: number; features: number },
): MvtLayer {
  const l = new Reader(r.buf, end);
  l.pos = start;
  let name = '';
  let extent = 4096;
  const spans: [number, number][] = [];
  while (l.pos < end) {
    const key = l.varint();
    const field = Math.floor(key / 8);
    const wire = key & 7;
    if (field === 1 && wire === 2) {
      const [s, e] = l.sub();
      name = new TextDecoder().decode(l.buf.subarray(s, Math.min(e, s + 200)));
    } else if (field === 2 && wire === 2) {
      if (--budget.features < 0) throw new Error('vector tile: too many features');
      spans.push(l.sub());
    } else if (field === 5 && wire === 0) extent = l.varint();
    else l.skip(wire);
  }
  if (!(extent > 0)) throw new Error('vector tile: layer extent must be > 0');
  const fr = new Reader(r.buf, end);
  return { name, extent, features: spans.map(([s, e]) => feature(fr, s, e, budget)) };
}

/** The layers of an MVT tile; throws on a malformed or oversized tile. */
export function decodeMvt(bytes: Uint8Array): MvtLayer[] {
  if (bytes.length > MVT_LIMITS.bytes) throw new Error('vector tile: larger than 4 MB');
  const r = new Reader(bytes);
  const budget = { points: MVT_LIMITS.points, features: MVT_LIMITS.features };
  const spans: [number, number][] = [];
  while (r.pos < r.end) {
    const key = r.varint();
    const wire = key & 7;
    if (Math.floor(key / 8) === 3 && wire === 2) spans.push(r.sub());
    else r.skip(wire);
  }
  return spans.map(([s, e]) => layer(r, s, e, budget));
}
