// The safety analysis as the printed brief shows it.
import type { BriefSafety, BriefZone } from './brief-html';
import { LocalFrame } from '../model';
import type { PlanResult } from '../planner';
import {
  blockingText,
  circumscribed,
  clearance_m,
  hazardPieces,
  itemOpen,
  type PlanSafety,
} from '../safety';

interface XY {
  x: number;
  y: number;
}
interface Box {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

function boxOf(pts: readonly XY[]): Box {
  const b = { x0: Infinity, y0: Infinity, x1: -Infinity, y1: -Infinity };
  for (const p of pts) {
    b.x0 = Math.min(b.x0, p.x);
    b.y0 = Math.min(b.y0, p.y);
    b.x1 = Math.max(b.x1, p.x);
    b.y1 = Math.max(b.y1, p.y);
  }
  return b;
}

/** Least distance between two boxes, m (0 when they touch or overlap). */
function boxGap(a: Box, b: Box): number {
  return Math.hypot(Math.max(0, a.x0 - b.x1, b.x0 - a.x1), Math.max(0, a.y0 - b.y1, b.y0 - a.y1));
}

/** Distinct corners of a closed GeoJSON ring ([lon, lat], last may repeat the first). */
function cornerCount(ring: readonly (readonly number[])[]): number {
  const n = ring.length;
  if (n > 1 && ring[0][0] === ring[n - 1][0] && ring[0][1] === ring[n - 1][1]) return n - 1;
  return n;
}

/**
 * Each no-drop zone with its corner count and, given the result, the site whose 99 % landing
 * ellipse (swept over its window or zone, as the no-drop check takes it) comes nearest.
 */
function zonesOf(s: PlanSafety, result?: PlanResult): BriefZone[] {
  const zones = s.settings.noDropZones;
  if (zones.length === 0) return [];
  let shapes: { site: string; ring: XY[]; box: Box }[] = [];
  let frame: LocalFrame | undefined;
  if (result) {
    frame = new LocalFrame(result.releasePoint);
    shapes = hazardPieces(result, frame)
      .filter((p) => p.kind === 'landing')
      .map((p) => {
        const ring = circumscribed(p.piece);
        return { site: p.site, ring, box: boxOf(ring) };
      });
  }
  return zones.map((z, i) => {
    const g = z.geometry;
    const polys = g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
    const zone: BriefZone = {
      name: String(z.properties?.name ?? '').trim() || `zone ${i + 1}`,
      corners: polys.reduce((a, p) => a + (p[0] ? cornerCount(p[0]) : 0), 0),
      holes: polys.reduce((a, p) => a + Math.max(0, p.length - 1), 0),
      rings: polys.map((p) => (p[0] ?? []).map(([lon, lat]) => [lat, lon] as [number, number])),
    };
    if (frame) {
      const f = frame;
      const zb = boxOf(
        polys.flatMap((p) => (p[0] ?? []).map(([lon, lat]) => f.toLocal({ lat, lon }))),
      );
      // Nearest boxes first; a box gap is a lower bound on the clearance, so stop once it is no
      // better than the best found.
      const order = shapes
        .map((sh) => ({ sh, gap: boxGap(sh.box, zb) }))
        .sort((a, b) => a.gap - b.gap);
      let best = Infinity;
      let site = '';
      for (const { sh, gap } of order) {
        if (gap >= best) break;
        const c = clearance_m(frame, sh.ring, g);
        if (c < best) {
          best = c;
          site = sh.site;
        }
      }
      if (site) zone.nearest = { site, clearance_m: best };
    }
    return zone;
  });
}

/** The safety part of the printed brief; with the result, each zone's nearest site too. */
export function briefSafety(s: PlanSafety, result?: PlanResult): BriefSafety {
  const geom = s.hazardArea.geometry;
  const polys = geom.type === 'Polygon' ? [geom.coordinates] : geom.coordinates;
  // Done with nobody named still stands in the way (readiness.ts).
  const open = s.checklist.filter(itemOpen).length;
  return {
    checks: s.checks.map((c) => ({
      id: c.id,
      title: c.title,
      status: c.status,
      why: c.why,
      ...(c.sites?.length ? { sites: [...c.sites] } : {}),
    })),
    hazardRings: polys.map((p) => p[0].map(([lon, lat]) => [lat, lon] as [number, number])),
    hazardArea_m2: s.hazardArea_m2,
    hazardBuffer_m: s.settings.hazardBuffer_m,
    noDropBuffer_m: s.settings.noDropBuffer_m,
    zones: zonesOf(s, result),
    manual: s.checklist,
    readiness: {
      ready: s.signedReady,
      overridden: s.readiness.overridden,
      reason: s.signoff?.reason,
      who: s.signoff?.who,
      when: s.signoff?.when,
      blocking: [
        ...blockingText(s, 'check'),
        ...(open > 0 ? [`${open} crew item(s) open`] : []),
        ...(s.signoffCurrent
          ? []
          : [s.signoff ? 'the sign-off was for an earlier version of the plan' : 'not signed off']),
      ],
    },
  };
}
