/**
 * Test files for the base map: solid-colour PNG tiles and small PMTiles v3 archives, written here
 * from the formats' specifications so the app's reader is checked against an outside writer.
 */
import { deflateSync } from 'node:zlib';

// --- PNG (W3C Portable Network Graphics Specification, 2nd ed.: signature, IHDR, IDAT, IEND) ---

const CRC_TABLE = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});

/** CRC-32 of the PNG specification (ISO 3309 polynomial), Annex D. */
function crc32(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Uint8Array): Buffer {
  const out = Buffer.alloc(12 + data.length);
  out.writeUInt32BE(data.length, 0);
  out.write(type, 4, 'latin1');
  Buffer.from(data).copy(out, 8);
  out.writeUInt32BE(crc32(out.subarray(4, 8 + data.length)), 8 + data.length);
  return out;
}

/** A size×size PNG of one colour (8-bit RGB, filter 0 on every row). */
export function solidPng(rgb: readonly [number, number, number], size = 256): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(size, 0);
  ihdr.writeUInt32BE(size, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 2; // colour type: truecolour
  const row = Buffer.alloc(1 + 3 * size);
  for (let i = 0; i < size; i++) row.set(rgb, 1 + 3 * i);
  const raw = Buffer.concat(Array.from({ length: size }, () => row));
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(raw)),
    chunk('IEND', new Uint8Array()),
  ]);
}

// --- PMTiles version 3 (the PMTiles v3 specification, protomaps: 127-byte header, directories
// of varint columns, tile ids along a Hilbert curve per zoom) ---

/** Position along the Hilbert curve of cell (x, y) in an n×n grid (the classic xy2d). */
function hilbert(n: number, x: number, y: number): number {
  let d = 0;
  const last = n - 1;
  for (let s = n / 2; s >= 1; s /= 2) {
    const rx = (x & s) > 0 ? 1 : 0;
    const ry = (y & s) > 0 ? 1 : 0;
    d += s * s * ((3 * rx) ^ ry);
    if (ry === 0) {
      if (rx === 1) {
        x = last - x;
        y = last - y;
      }
      [x, y] = [y, x];
    }
  }
  return d;
}

/** The spec's tile id: tiles of all lower zooms, then the Hilbert position within zoom z. */
export function tileId(z: number, x: number, y: number): number {
  let base = 0;
  for (let i = 0; i < z; i++) base += 4 ** i;
  return base + hilbert(2 ** z, x, y);
}

function varints(values: number[]): number[] {
  const out: number[] = [];
  for (let v of values) {
    while (v >= 0x80) {
      out.push((v % 0x80) | 0x80);
      v = Math.floor(v / 0x80);
    }
    out.push(v);
  }
  return out;
}

/** Tile types of the header (spec: 1 MVT, 2 PNG). */
export const TILE_MVT = 1;
export const TILE_PNG = 2;

/** What an archive holds: every tile listed points at the one `tile` (the spec allows sharing). */
export interface ArchiveSpec {
  tiles: { z: number; x: number; y: number }[];
  tile: Uint8Array;
  tileType: number;
  minZoom: number;
  maxZoom: number;
  /** [west, south, east, north] degrees */
  bounds: [number, number, number, number];
  metadata: Record<string, unknown>;
}

/** A PMTiles v3 archive: header, an uncompressed root directory, JSON metadata, tile data. */
export function pmtilesArchive(spec: ArchiveSpec): Buffer {
  const ids = [...new Set(spec.tiles.map((t) => tileId(t.z, t.x, t.y)))].sort((a, b) => a - b);
  const deltas = ids.map((id, i) => (i === 0 ? id : id - ids[i - 1]));
  const dir = Buffer.from([
    ...varints([ids.length]),
    ...varints(deltas),
    ...varints(ids.map(() => 1)), // run lengths
    ...varints(ids.map(() => spec.tile.length)), // lengths
    // offsets + 1 (0 would mean "right after the previous tile"; all share offset 0)
    ...varints(ids.map(() => 1)),
  ]);
  const meta = Buffer.from(JSON.stringify(spec.metadata), 'utf8');
  const h = Buffer.alloc(127);
  h.write('PMTiles', 0, 'latin1');
  h[7] = 3;
  const u64 = (at: number, v: number): void => {
    h.writeBigUInt64LE(BigInt(v), at);
  };
  const dirOffset = 127;
  const metaOffset = dirOffset + dir.length;
  const dataOffset = metaOffset + meta.length;
  u64(8, dirOffset);
  u64(16, dir.length);
  u64(24, metaOffset);
  u64(32, meta.length);
  u64(40, dataOffset); // no leaf directories
  u64(48, 0);
  u64(56, dataOffset);
  u64(64, spec.tile.length);
  u64(72, ids.length); // addressed tiles
  u64(80, ids.length); // tile entries
  u64(88, 1); // tile contents
  h[96] = 0; // not clustered (entries share one content)
  h[97] = 1; // internal compression: none
  h[98] = 1; // tile compression: none
  h[99] = spec.tileType;
  h[100] = spec.minZoom;
  h[101] = spec.maxZoom;
  const [w, s, e, n] = spec.bounds;
  h.writeInt32LE(Math.round(w * 1e7), 102);
  h.writeInt32LE(Math.round(s * 1e7), 106);
  h.writeInt32LE(Math.round(e * 1e7), 110);
  h.writeInt32LE(Math.round(n * 1e7), 114);
  h[118] = spec.minZoom;
  h.writeInt32LE(Math.round(((w + e) / 2) * 1e7), 119);
  h.writeInt32LE(Math.round(((s + n) / 2) * 1e7), 123);
  return Buffer.concat([h, dir, meta, Buffer.from(spec.tile)]);
}

// --- Mapbox Vector Tile (the MVT specification 2.1: protocol buffer Tile → Layer (field 3) →
// Feature (field 2); a feature's type is field 3, its geometry commands field 4, packed) ---

const key = (field: number, wire: number): number[] => varints([field * 8 + wire]);
const bytesField = (field: number, bytes: number[]): number[] => [
  ...key(field, 2),
  ...varints([bytes.length]),
  ...bytes,
];

/** One MVT layer to write: its features' types (1 point, 2 line, 3 polygon) and raw commands. */
export interface MvtLayerSpec {
  name: string;
  extent?: number;
  features: { type: number; geometry: number[] }[];
}

/** An MVT tile's bytes (layer version 2, no tags). */
export function mvtTile(layers: MvtLayerSpec[]): Uint8Array {
  const out: number[] = [];
  for (const l of layers) {
    const body = [
      ...key(15, 0),
      2,
      ...bytesField(1, [...Buffer.from(l.name, 'utf8')]),
      ...l.features.flatMap((f) =>
        bytesField(2, [...key(3, 0), ...varints([f.type]), ...bytesField(4, varints(f.geometry))]),
      ),
      ...key(5, 0),
      ...varints([l.extent ?? 4096]),
    ];
    out.push(...bytesField(3, body));
  }
  return Uint8Array.from(out);
}

/** A geometry command integer: command id in the low 3 bits, count above. */
export const command = (id: number, count: number): number => (id & 7) | (count << 3);
/** Zigzag encoding of a signed delta. */
export const zz = (n: number): number => (n << 1) ^ (n >> 31);
