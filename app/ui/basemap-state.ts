/**
 * The base map in use, shared by the map and the settings panel: the opened PMTiles archive of the
 * plan being edited (kept with that plan in IndexedDB, basemap-store.ts) and the count of tiles
 * kept for it from the tile URL. The plan library names the plan (switchPlan). The archive is
 * hostile input: its header, zooms, bounds and metadata are checked, its attribution is text.
 */
import { PMTiles, TileType, type Header } from 'pmtiles';
import { errorText } from './safe-storage';
import {
  adoptLegacy,
  countTiles,
  forgetArchive,
  hasBasemapStorage,
  LEGACY_PLAN,
  loadArchive,
  saveArchive,
} from './basemap-store';

/** Largest archive opened and kept (browser storage is shared with plans and elevation models). */
export const MAX_ARCHIVE_BYTES = 1024 ** 3;
/** Longest attribution shown: a line or two of credits. */
export const MAX_ARCHIVE_ATTRIBUTION = 500;
/** Deepest zoom an archive may name (PMTiles v3 tile ids hold zooms up to 26 in JavaScript). */
const MAX_ZOOM = 26;

/** What the app knows of an opened archive. */
export interface ArchiveInfo {
  name: string;
  bytes: number;
  /** raster: drawn as images; vector: MVT, drawn in our own colours; other: not drawn */
  kind: 'raster' | 'vector' | 'other';
  /** 'PNG', 'JPEG', 'WebP', 'AVIF', 'MVT vector', 'MLT vector' or 'unknown' */
  tileKind: string;
  mime: string;
  minZoom: number;
  maxZoom: number;
  /** [south, west, north, east] degrees, or null when the header's bounds are not usable */
  bounds: [number, number, number, number] | null;
  attribution: string;
}

const KINDS: Record<number, [ArchiveInfo['kind'], string, string]> = {
  [TileType.Png]: ['raster', 'PNG', 'image/png'],
  [TileType.Jpeg]: ['raster', 'JPEG', 'image/jpeg'],
  [TileType.Webp]: ['raster', 'WebP', 'image/webp'],
  [TileType.Avif]: ['raster', 'AVIF', 'image/avif'],
  [TileType.Mvt]: ['vector', 'MVT vector', ''],
  [TileType.Mlt]: ['other', 'MLT vector', ''],
};

/** Text of hostile metadata: control characters out, length capped. */
function cleanText(v: unknown, max: number): string {
  if (typeof v !== 'string') return '';
  let out = '';
  for (const ch of v) out += ch < ' ' || ch === '\u007f' ? ' ' : ch;
  return out.replace(/ {2,}/g, ' ').trim().slice(0, max);
}

function usableBounds(h: Header): ArchiveInfo['bounds'] {
  const { minLat, minLon, maxLat, maxLon } = h;
  const ok =
    [minLat, minLon, maxLat, maxLon].every(Number.isFinite) &&
    minLat >= -90 &&
    maxLat <= 90 &&
    minLon >= -180 &&
    maxLon <= 180 &&
    minLat < maxLat &&
    minLon < maxLon;
  return ok ? [minLat, minLon, maxLat, maxLon] : null;
}

/** Reads and checks an archive's header and metadata; throws a message naming what is wrong. */
export async function readArchive(
  name: string,
  file: Blob,
): Promise<{ pm: PMTiles; info: ArchiveInfo }> {
  if (file.size > MAX_ARCHIVE_BYTES) {
    throw new Error(
      `${name}: ${(file.size / 1e6).toFixed(0)} MB is more than the ${MAX_ARCHIVE_BYTES / 1024 ** 3} GiB limit for a base map archive`,
    );
  }
  if (file.size < 127)
    throw new Error(`${name}: too short for a PMTiles archive (127-byte header)`);
  const asFile = file instanceof File ? file : new File([file], name);
  const pm = new PMTiles(new FileSourceOf(asFile));
  let h: Header;
  try {
    h = await pm.getHeader();
  } catch (e) {
    throw new Error(`${name}: not a PMTiles version 3 archive (${errorText(e)})`, { cause: e });
  }
  if (h.specVersion !== 3) {
    throw new Error(`${name}: PMTiles version ${h.specVersion}; only version 3 is read`);
  }
  if (!(h.minZoom <= h.maxZoom && h.maxZoom <= MAX_ZOOM)) {
    throw new Error(
      `${name}: zooms ${h.minZoom} to ${h.maxZoom} are not a range within 0 to ${MAX_ZOOM}`,
    );
  }
  // Metadata is optional for drawing; without it there is no attribution to show.
  const meta: unknown = await pm.getMetadata().catch(() => null);
  const m = meta && typeof meta === 'object' ? (meta as Record<string, unknown>) : {};
  const [kind, tileKind, mime] = KINDS[h.tileType] ?? ['other', 'unknown', ''];
  return {
    pm,
    info: {
      name: name.slice(0, 1000),
      bytes: file.size,
      kind,
      tileKind,
      mime,
      minZoom: h.minZoom,
      maxZoom: h.maxZoom,
      bounds: usableBounds(h),
      attribution: cleanText(m.attribution, MAX_ARCHIVE_ATTRIBUTION),
    },
  };
}

/** pmtiles' FileSource keyed by a unique name, so two archives of one file name never share a cache. */
class FileSourceOf {
  private static next = 0;
  private readonly key = `file-${FileSourceOf.next++}`;
  constructor(private readonly file: File) {}
  getKey(): string {
    return this.key;
  }
  async getBytes(offset: number, length: number): Promise<{ data: ArrayBuffer }> {
    return { data: await this.file.slice(offset, offset + length).arrayBuffer() };
  }
}

/** The base map state; 'change' fires on every change. */
export class BasemapState extends EventTarget {
  archive: { pm: PMTiles; info: ArchiveInfo } | null = null;
  /** 'loading' while an archive is read; the message says why the last open failed, if it did */
  status: { state: 'idle' | 'loading'; message: string } = { state: 'idle', message: '' };
  /** tiles kept from the tile URL (any template), or null before counted */
  keptTiles: number | null = null;
  /** the key the files are kept under: the plan being edited, or LEGACY_PLAN without a library */
  plan = LEGACY_PLAN;
  private planSet = false;
  private generation = 0;
  private markKnown!: () => void;
  private readonly known = new Promise<void>((resolve) => (this.markKnown = resolve));

  private changed(): void {
    this.dispatchEvent(new Event('change'));
  }

  /** Resolves once the plan's kept base map has been brought back (after the first switchPlan). */
  restore(): Promise<void> {
    return this.known;
  }

  /**
   * Another plan is being edited (null: no library): its kept archive and tile count come in, or
   * none. The first call moves an earlier version's one base map to that plan.
   */
  async switchPlan(id: string | null): Promise<void> {
    const first = !this.planSet;
    this.planSet = true;
    const gen = ++this.generation;
    this.plan = id ?? LEGACY_PLAN;
    this.archive = null;
    this.keptTiles = null;
    this.status = { state: 'idle', message: '' };
    this.changed();
    try {
      if (!hasBasemapStorage()) return;
      if (first) {
        try {
          await adoptLegacy(this.plan);
        } catch (e) {
          this.status = {
            state: 'idle',
            message: `The base map kept before plans had their own could not be moved to this plan (${errorText(e)}); it is left where it was.`,
          };
        }
      }
      try {
        const kept = await loadArchive(this.plan);
        const read = kept ? await readArchive(kept.name, kept.file) : null;
        if (gen === this.generation) this.archive = read;
      } catch (e) {
        if (gen === this.generation) {
          this.status = { state: 'idle', message: `The kept base map archive: ${errorText(e)}` };
        }
      }
      if (gen === this.generation) await this.recount();
    } finally {
      if (gen === this.generation) this.changed();
      this.markKnown();
    }
  }

  /** Counts the kept tiles again (after a fetch). */
  async recount(): Promise<void> {
    const plan = this.plan;
    let n: number | null;
    try {
      n = await countTiles(plan);
    } catch {
      n = null;
    }
    if (plan !== this.plan) return;
    this.keptTiles = n;
    this.changed();
  }

  /** Opens `file` as the base map and keeps it; on failure the archive in use stays. */
  async open(file: File): Promise<void> {
    const plan = this.plan;
    this.status = { state: 'loading', message: '' };
    this.changed();
    try {
      const opened = await readArchive(file.name, file);
      if (plan !== this.plan) {
        this.status = { state: 'idle', message: '' }; // another plan was opened meanwhile
        return;
      }
      this.archive = opened;
      this.status = { state: 'idle', message: '' };
      this.changed();
      try {
        await saveArchive(plan, file.name, file);
      } catch (e) {
        this.status = {
          state: 'idle',
          message: `${file.name} is in use but not kept for the next visit: ${errorText(e)}`,
        };
      }
    } catch (e) {
      this.status = { state: 'idle', message: errorText(e) };
    }
    this.changed();
  }

  /** Stops using the archive and deletes the copy kept with the plan. */
  async forget(): Promise<void> {
    const plan = this.plan;
    this.archive = null;
    this.status = { state: 'idle', message: '' };
    this.changed();
    try {
      await forgetArchive(plan);
    } catch (e) {
      this.status = { state: 'idle', message: `The kept archive was not deleted: ${errorText(e)}` };
      this.changed();
    }
  }
}

/** The one base map state of the page. */
export const basemap = new BasemapState();
