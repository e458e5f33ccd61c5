/**
 * Brings an elevation model file to the planner: reads the window about the plan area in the
 * DEM worker, hands the model to the store (store.dem), keeps the file in IndexedDB with the plan
 * being edited (the plan library) for the next visit, and reads it again when an edit moves the plan area out of the window read.
 */
import { Dem, type LatLonBox, utmZoneEpsg } from '../formats';
import type { Plan } from '../plan';
import { sweepHeightsAGL, terrainArea } from '../planner';
import type { DemReply, DemRequest } from '../worker';
import type { PlanStore } from './plan-store';
import { errorText } from './safe-storage';
import { hasTerrainStorage, terrainStorageWhy } from './terrain-store';

/** What the last read took from the file (shown in the Terrain section). */
export interface TerrainInfo {
  cellsRead: number;
  bytesRead: number;
  fileCols: number;
  fileRows: number;
  /** the file's size, bytes */
  fileBytes: number;
  /** the area read (it holds the plan area; grown so small edits need no new read) */
  box: LatLonBox;
}

/** A file and how to read it. */
interface Source {
  name: string;
  file: Blob;
}

/** A name the plan file's terrain.file accepts (plan.schema.json: .tif/.tiff/.asc, no control characters). */
const PLAN_FILE_NAME = /^[^\p{Cc}]{0,995}\.(?:tiff?|asc)$/iu;

/** Quiet time after an edit before the plan area is checked against the window read (ms). */
const REREAD_DELAY_MS = 500;

/** The area twice as wide and tall about its centre, inside the WGS 84 limits. */
export function grownBox(b: LatLonBox): LatLonBox {
  const h = (b.north - b.south) / 2;
  const w = (b.east - b.west) / 2;
  return {
    south: Math.max(-90, b.south - h),
    north: Math.min(90, b.north + h),
    west: Math.max(-180, b.west - w),
    east: Math.min(180, b.east + w),
  };
}

/** The smallest box holding a and b. */
function union(a: LatLonBox, b: LatLonBox): LatLonBox {
  return {
    south: Math.min(a.south, b.south),
    north: Math.max(a.north, b.north),
    west: Math.min(a.west, b.west),
    east: Math.max(a.east, b.east),
  };
}

/**
 * The areas to read, most first: the plan area grown (grownBox) with what the altitude sweep's
 * highest release needs, then the plan area with the sweep's, then the plan area alone.
 */
export function areasToRead(plan: Plan, area: LatLonBox = terrainArea(plan)): LatLonBox[] {
  let sweep = area;
  try {
    const r = plan.release;
    const msl = r.altitude_m + (r.reference === 'AGL' ? plan.groundElevation_m : 0);
    const top = Math.max(...sweepHeightsAGL(plan, msl));
    sweep = terrainArea({ ...plan, release: { ...r, altitude_m: top, reference: 'AGL' } });
  } catch {
    // the sweep's area is a convenience; the plan's own is what must be read
  }
  return [union(grownBox(area), sweep), union(area, sweep), area];
}

/** True when box a lies inside box b. */
export function boxInside(a: LatLonBox, b: LatLonBox): boolean {
  return a.south >= b.south && a.north <= b.north && a.west >= b.west && a.east <= b.east;
}

/** One loader per store (store.terrain). */
export class TerrainLoader {
  /** What the read of the model in use took; null with no model. */
  info: TerrainInfo | null = null;
  /** Reads sent to the worker, and checks of the plan area after edits, so far (for tests). */
  reads = 0;
  areaChecks = 0;
  /** The file of the model in use (read again when the plan area leaves its window). */
  private kept: Source | null = null;
  private readBox: LatLonBox | null = null;
  /** The plan area last read for (a read that failed is not tried again for the same area). */
  private triedArea = '';
  private seenPlan: unknown = null;
  private worker: Worker | undefined;
  private lastId = 0;
  private timer: ReturnType<typeof setTimeout> | undefined;
  private started = false;

  constructor(private readonly store: PlanStore) {}

  /** Listens for plan edits and brings back the model kept with the plan (once the library is open). */
  start(): void {
    if (this.started) return;
    this.started = true;
    this.store.addEventListener('change', () => this.planChanged());
    void this.store.library.ready.then(() => this.restore());
  }

  /** Another plan of the library is being edited: the model kept with it (or none) comes in. */
  async switchPlan(): Promise<void> {
    this.lastId++; // a read under way belongs to the plan before
    clearTimeout(this.timer);
    this.kept = null;
    this.readBox = null;
    this.info = null;
    this.triedArea = '';
    this.store.setTerrain(null, { name: '', state: 'none' });
    await this.restore();
  }

  /** The name of the file in use, or '' with none. */
  get fileName(): string {
    return this.kept?.name ?? '';
  }

  /** Opens a file picked by the person: read, used, and kept for the next visit. */
  async open(file: Blob, name: string): Promise<void> {
    const ok = await this.read({ name, file }, 'open');
    if (!ok) return;
    if (!hasTerrainStorage()) {
      this.storageFailed(name, new Error('this browser has no IndexedDB'));
      return;
    }
    try {
      await this.store.library.putDem({ name, file, savedAt: new Date().toISOString() });
    } catch (e) {
      this.storageFailed(name, e);
    }
  }

  /** Stops using the model and forgets the kept file. */
  async remove(): Promise<void> {
    this.lastId++; // a read under way is no longer wanted
    clearTimeout(this.timer);
    const name = this.kept?.name ?? this.store.terrainStatus.name;
    this.kept = null;
    this.readBox = null;
    this.info = null;
    this.triedArea = '';
    this.store.setTerrain(null, { name: '', state: 'none' });
    if (this.store.get('terrain') !== undefined) this.store.edit('terrain', undefined);
    if (!hasTerrainStorage()) return;
    try {
      await this.store.library.deleteDem();
    } catch (e) {
      this.store.setNotice(
        'error',
        `${name} could not be removed from browser storage (${terrainStorageWhy(e)}); it may come back on the next visit.`,
      );
    }
  }

  // ---- internals -----------------------------------------------------------------------

  private async restore(): Promise<void> {
    if (!hasTerrainStorage()) return;
    const before = this.lastId;
    let t;
    try {
      t = await this.store.library.getDem();
    } catch (e) {
      const message = `The elevation model kept in this browser could not be read: ${terrainStorageWhy(e)}.`;
      this.store.notice = { kind: 'error', text: message };
      this.store.setTerrain(this.store.dem, { name: '', state: 'error', message });
      return;
    }
    if (!t || this.kept || this.lastId !== before) return; // nothing kept, or a file was opened meanwhile
    this.kept = { name: t.name, file: t.file };
    const named = this.store.plan?.terrain?.file;
    if (named && baseName(named) !== t.name) {
      this.store.notice = {
        kind: 'info',
        text: `The plan names the elevation model ${named}; the one kept in this browser, ${t.name}, is used. Open ${baseName(named)} to use it instead.`,
      };
    }
    await this.read(this.kept, 'restore');
  }

  private planChanged(): void {
    const plan = this.store.plan;
    if (!this.kept || !plan || plan === this.seenPlan) return;
    this.seenPlan = plan;
    clearTimeout(this.timer);
    this.timer = setTimeout(() => this.checkArea(), REREAD_DELAY_MS);
  }

  /** Reads the kept file again when the plan area has left the window read. */
  private checkArea(): void {
    this.areaChecks++;
    const plan = this.store.plan;
    if (!this.kept || !plan) return;
    let area: LatLonBox;
    try {
      area = terrainArea(plan);
    } catch {
      return; // the planner reports a plan it cannot handle
    }
    if (this.readBox && boxInside(area, this.readBox)) return;
    if (JSON.stringify(area) === this.triedArea) return;
    void this.read(this.kept, 'reread');
  }

  /**
   * Reads src about the current plan area. On success the store gets the model; on failure the
   * model in use and the results stay, and the message (naming the file) stands in the section
   * and the status line. True when the model was read.
   */
  private async read(src: Source, why: 'open' | 'restore' | 'reread'): Promise<boolean> {
    const s = this.store;
    const plan = s.plan;
    if (!plan) {
      // The area to read comes from the plan. A kept file is read once the plan is valid (planChanged).
      if (why === 'open') {
        this.fail(
          src,
          `${src.name}: the plan has problems, and the area to read comes from a valid plan; fix them and open the file again`,
          why,
        );
      } else {
        const message = `${src.name}: read once the plan is valid (it says which area to read)`;
        s.setTerrain(s.dem, { name: src.name, state: 'loading', message });
      }
      return false;
    }
    let area: LatLonBox;
    try {
      area = terrainArea(plan);
    } catch (e) {
      this.fail(src, `${src.name}: the plan area could not be worked out (${errorText(e)})`, why);
      return false;
    }
    this.triedArea = JSON.stringify(area);
    s.setTerrain(s.dem, { name: src.name, state: 'loading' });
    let reply: DemReply;
    const id = ++this.lastId;
    this.reads++;
    try {
      reply = await this.ask({
        id,
        file: src.file,
        name: src.name,
        boxes: areasToRead(plan, area),
        utmEpsg: utmZoneEpsg(plan.release),
      });
    } catch (e) {
      if (id === this.lastId) this.fail(src, `${src.name}: ${errorText(e)}`, why);
      return false;
    }
    if (id !== this.lastId) return false; // a newer read or a removal came since
    if (reply.kind === 'error') {
      this.fail(src, reply.message, why);
      return false;
    }
    let dem: Dem;
    try {
      dem = new Dem(reply.grid);
    } catch (e) {
      this.fail(src, errorText(e), why);
      return false;
    }
    this.kept = src;
    this.readBox = reply.box;
    this.info = {
      cellsRead: reply.cellsRead,
      bytesRead: reply.bytesRead,
      fileCols: reply.fileCols,
      fileRows: reply.fileRows,
      fileBytes: src.file.size,
      box: reply.box,
    };
    if (why === 'open') s.notice = { kind: 'info', text: `Elevation model ${src.name} read.` };
    s.setTerrain(dem, { name: src.name, state: 'ready' });
    // The plan names its model (plan file field terrain.file), so a saved plan says what it was flown over.
    if (why === 'open' && s.get('terrain.file') !== src.name && PLAN_FILE_NAME.test(src.name)) {
      s.edit('terrain', { file: src.name });
    }
    return true;
  }

  private fail(src: Source, message: string, why: 'open' | 'restore' | 'reread'): void {
    const s = this.store;
    const text =
      why === 'restore'
        ? `${message} (the model kept in this browser stays kept; Remove deletes it)`
        : message;
    s.notice = { kind: 'error', text: `Elevation model not read: ${text}` };
    s.setTerrain(s.dem, { name: src.name, state: 'error', message: text });
  }

  private storageFailed(name: string, e: unknown): void {
    const message = `${name} is in use but could not be kept for the next visit or offline use: ${terrainStorageWhy(e)}`;
    this.store.notice = { kind: 'error', text: message };
    this.store.setTerrain(this.store.dem, { name, state: 'ready', message });
  }

  /** One request to the DEM worker (started on first use, started again after it fails). */
  private ask(req: DemRequest): Promise<DemReply> {
    return new Promise((resolve, reject) => {
      let w: Worker;
      try {
        w = this.worker ??= new Worker(new URL('../worker/dem-worker.ts', import.meta.url), {
          type: 'module',
        });
      } catch (e) {
        reject(new Error(`the elevation model reader could not start (${errorText(e)})`));
        return;
      }
      const lost = (why: string): void => {
        w.terminate();
        if (this.worker === w) this.worker = undefined;
        reject(new Error(why));
      };
      w.onmessage = (ev: MessageEvent<DemReply>) => {
        if (ev.data.id === req.id) resolve(ev.data);
      };
      w.onerror = (ev: ErrorEvent) => {
        ev.preventDefault();
        lost(
          ev.message
            ? `the elevation model reader stopped (${ev.message})`
            : 'the elevation model reader could not start (its script did not load)',
        );
      };
      w.onmessageerror = () => lost('the elevation model reader sent an unreadable answer');
      w.postMessage(req);
    });
  }
}

/** The last part of a path ('dem/valley.tif' → 'valley.tif'). */
export function baseName(path: string): string {
  return path.split(/[\\/]/).pop() ?? path;
}
