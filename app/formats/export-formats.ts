/**
 * Plan results written to open exchange formats: GeoJSON (RFC 7946), KML 2.2 (OGC 07-147r2),
 * GPX 1.1 and CSV (RFC 4180), plus a sites-only CSV that `importSites` reads back.
 *
 * Pure: strings and plain objects out, no DOM. Rings and track lines are built here from the
 * core's rings.ts (shared with app/map/geometry.ts),
 * so every vertex's distance and azimuth from its centre is geodesic.
 */
import Papa from 'papaparse';
import { alongTrack, ellipseRingLatLon, formatUTM, type LatLon, toMGRS } from '../model';
import type { Plan, ResolvedSite } from '../plan';
import type { GeoEllipse, PlanResult, SiteResult } from '../planner';

/** A GeoJSON position [lon, lat] in degrees (RFC 7946 §3.1.1). */
export type Position = [number, number];

export type PolygonGeometry =
  | { type: 'Polygon'; coordinates: Position[][] }
  | { type: 'MultiPolygon'; coordinates: Position[][][] };

export type Geometry =
  | { type: 'Point'; coordinates: Position }
  | { type: 'LineString'; coordinates: Position[] }
  | PolygonGeometry;

export interface Feature {
  type: 'Feature';
  geometry: Geometry;
  properties: Record<string, unknown>;
}

export interface FeatureCollection {
  type: 'FeatureCollection';
  features: Feature[];
}

/** A polygonal area as input: positions may be plain number arrays (e.g. turf or @types/geojson). */
export type PolygonInput =
  | { type: 'Polygon'; coordinates: number[][][] }
  | { type: 'MultiPolygon'; coordinates: number[][][][] };

export interface GeoJSONOptions {
  /** A hazard area to include as a 'hazard' feature: a Polygon/MultiPolygon or a Feature of one (e.g. hazardArea().feature). */
  hazardArea?:
    | PolygonInput
    | { type: 'Feature'; geometry: PolygonInput; properties?: Record<string, unknown> | null };
}

export interface CsvOptions {
  /** Start with a UTF-8 byte-order mark, so spreadsheets read accented names as UTF-8. */
  bom?: boolean;
}

export interface ScheduleOptions extends CsvOptions {
  /** Coordinate columns to write; all three forms when absent. */
  coords?: 'decimal' | 'utm' | 'mgrs';
}

// ---------------------------------------------------------------- shared geometry

/** Degrees rounded to 7 decimals (≈ 1 cm), without negative zero. */
const r7 = (x: number): number => Math.round(x * 1e7) / 1e7 + 0;
const round = (x: number, d: number): number => Math.round(x * 10 ** d) / 10 ** d + 0;
const pos = (p: LatLon): Position => [r7(p.lon), r7(p.lat)];

// Smallest drawn semi-axis, m: a zero-size ellipse would be a degenerate ring. The true
// sizes stay in the properties.
const MIN_AXIS_M = 0.3;

/** Closed ring on an ellipse (semi-axes m, major axis azimuth degrees true), [lon, lat]. */
function ellipsePositions(c: LatLon, a_m: number, b_m: number, az_deg: number, n = 72): Position[] {
  const ring = ellipseRingLatLon(
    c,
    Math.max(a_m, MIN_AXIS_M),
    Math.max(b_m, MIN_AXIS_M),
    az_deg,
    n,
  );
  return ccw(ring.map(pos));
}

/** Twice the signed planar area of a closed [lon, lat] ring; > 0 when counter-clockwise. */
function shoelace(ring: Position[]): number {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++) {
    s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  }
  return s;
}

// RFC 7946 §3.1.6: exterior rings counter-clockwise, holes clockwise.
const ccw = (ring: Position[]): Position[] => (shoelace(ring) < 0 ? [...ring].reverse() : ring);
const cw = (ring: Position[]): Position[] => (shoelace(ring) > 0 ? [...ring].reverse() : ring);

function orientPolygon(rings: number[][][]): Position[][] {
  return rings.map((ring, i) => {
    const rounded = ring.map((p): Position => [r7(p[0]), r7(p[1])]);
    return i === 0 ? ccw(rounded) : cw(rounded);
  });
}

/** Point on the carrier track time_s seconds after passing the plan's release point. */
function trackPoint(result: PlanResult, time_s: number): LatLon {
  return alongTrack(
    result.releasePoint,
    result.track.trackDeg,
    result.track.groundSpeed_mps * time_s,
  );
}

/** Track span, s: −60…+60 around the plan's release point, widened to cover every window and release. */
function trackSpan(result: PlanResult): [number, number] {
  let lo = -60;
  let hi = 60;
  for (const s of result.sites) {
    lo = Math.min(lo, s.release.time_s, s.releaseWindow?.open_s ?? 0);
    hi = Math.max(hi, s.release.time_s, s.releaseWindow?.close_s ?? 0);
  }
  return [Math.floor(lo), Math.ceil(hi)];
}

/** Times of track vertices, about every 10 s from `from` to `to` inclusive. */
function trackTimes(from: number, to: number): number[] {
  const n = Math.max(1, Math.min(200, Math.round((to - from) / 10)));
  return Array.from({ length: n + 1 }, (_, i) => from + ((to - from) * i) / n);
}

const moving = (result: PlanResult): boolean => result.track.groundSpeed_mps > 0;

/** The resolved plan site of a result (same index in planDrop's output; by id as a fallback). */
function planSite(plan: Plan, result: PlanResult, i: number): ResolvedSite {
  const id = result.sites[i].id;
  return plan.sites[i]?.id === id
    ? plan.sites[i]
    : (plan.sites.find((s) => s.id === id) ?? plan.sites[i]);
}

const ellipseRingOf = (e: GeoEllipse): Position[] =>
  ellipsePositions(e.center, e.semiMajor_m, e.semiMinor_m, e.azimuth_deg);

const signed = (t: number): string => `${t >= 0 ? '+' : '−'}${Math.abs(t).toFixed(1)} s`;

/** One-line human summary of a site's release, used in KML and GPX descriptions. */
function releaseText(r: SiteResult): string {
  const parts = [
    `site ${r.id} (${r.name})`,
    `variant ${r.variant}`,
    `release ${signed(r.release.time_s)}`,
  ];
  const w = r.releaseWindow;
  if (w) parts.push(`window ${signed(w.open_s)} to ${signed(w.close_s)}, best ${signed(w.best_s)}`);
  if (r.releaseZone) parts.push(`hover within ${r.releaseZone.radius_m.toFixed(1)} m`);
  if (!w && !r.releaseZone) parts.push('no release window meets the required P(hit)');
  if (r.headingTrue_deg !== undefined) {
    const mag = r.headingMag_deg == null ? '' : ` / ${r.headingMag_deg.toFixed(0)}° magnetic`;
    parts.push(
      `heading ${r.headingTrue_deg.toFixed(0)}° true${mag}, thrust ${(r.thrustTime_s ?? 0).toFixed(1)} s`,
    );
  }
  parts.push(`P(hit) ${r.pHit.toFixed(2)}, CEP ${r.cep_m.toFixed(1)} m`);
  return parts.join('; ');
}

// ---------------------------------------------------------------- GeoJSON

/** RFC 7946 FeatureCollection of sites, releases, landings, areas, windows and the track. */
export function toGeoJSON(
  plan: Plan,
  result: PlanResult,
  opts: GeoJSONOptions = {},
): FeatureCollection {
  const features: Feature[] = [];
  const add = (geometry: Geometry, properties: Record<string, unknown>): void => {
    features.push({ type: 'Feature', geometry, properties });
  };
  result.sites.forEach((r, i) => {
    const s = planSite(plan, result, i);
    const tag = { site: r.id, variant: r.variant };
    add(
      { type: 'Point', coordinates: pos(s) },
      {
        kind: 'site',
        id: r.id,
        name: r.name,
        variant: r.variant,
        pinned: r.pinned,
        recommended: r.recommended,
        pHit: round(r.pHit, 4),
        cep_m: round(r.cep_m, 2),
        reachable: r.reachable,
        meetsRequired: r.meetsRequired,
        tolerance_m: s.tolerance_m,
        elevation_m: s.elevation_m,
      },
    );
    add(
      { type: 'Point', coordinates: pos(r.release) },
      { kind: 'release', name: `R-${r.id}`, ...tag, time_s: round(r.release.time_s, 2) },
    );
    add(
      { type: 'Point', coordinates: pos(r.nominalLanding) },
      {
        kind: 'landing',
        ...tag,
        fallTime_s: round(r.fallTime_s, 2),
        nominalMiss_m: round(r.nominalMiss_m, 2),
      },
    );
    if (r.reachRadius_m > 0) {
      add(
        {
          type: 'Polygon',
          coordinates: [
            ellipsePositions(r.nominalLanding, r.reachRadius_m, r.reachRadius_m, 0, 96),
          ],
        },
        { kind: 'reach', ...tag, radius_m: round(r.reachRadius_m, 2) },
      );
    }
    for (const [kind, e] of [
      ['ellipse50', r.ellipse50],
      ['ellipse95', r.ellipse95],
    ] as const) {
      add(
        { type: 'Polygon', coordinates: [ellipseRingOf(e)] },
        {
          kind,
          ...tag,
          semiMajor_m: round(e.semiMajor_m, 2),
          semiMinor_m: round(e.semiMinor_m, 2),
          azimuth_deg: round(e.azimuth_deg, 1),
        },
      );
    }
    const w = r.releaseWindow;
    if (w && moving(result)) {
      add(
        {
          type: 'LineString',
          coordinates: [pos(trackPoint(result, w.open_s)), pos(trackPoint(result, w.close_s))],
        },
        {
          kind: 'window',
          ...tag,
          open_s: round(w.open_s, 2),
          close_s: round(w.close_s, 2),
          best_s: round(w.best_s, 2),
        },
      );
    }
    const z = r.releaseZone;
    if (z && Number.isFinite(z.radius_m)) {
      add(
        { type: 'Polygon', coordinates: [ellipsePositions(z.center, z.radius_m, z.radius_m, 0)] },
        { kind: 'zone', ...tag, radius_m: round(z.radius_m, 2) },
      );
    }
  });
  if (moving(result)) {
    const [from, to] = trackSpan(result);
    add(
      {
        type: 'LineString',
        coordinates: trackTimes(from, to).map((t) => pos(trackPoint(result, t))),
      },
      {
        kind: 'track',
        trackDeg: result.track.trackDeg,
        groundSpeed_mps: result.track.groundSpeed_mps,
        from_s: from,
        to_s: to,
      },
    );
  }
  const h = opts.hazardArea;
  if (h) {
    const g = h.type === 'Feature' ? h.geometry : h;
    const extra = h.type === 'Feature' ? (h.properties ?? {}) : {};
    const geometry: PolygonGeometry =
      g.type === 'Polygon'
        ? { type: 'Polygon', coordinates: orientPolygon(g.coordinates) }
        : { type: 'MultiPolygon', coordinates: g.coordinates.map(orientPolygon) };
    add(geometry, { ...extra, kind: 'hazard' });
  }
  return { type: 'FeatureCollection', features };
}

// ---------------------------------------------------------------- XML helpers

/** XML 1.0 text/attribute escape; characters XML 1.0 cannot carry are replaced by U+FFFD. */
export function xmlEscape(text: string): string {
  return String(text)
    .replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g, '\uFFFD') // eslint-disable-line no-control-regex
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&apos;');
}

const el = (tag: string, text: string | number): string =>
  `<${tag}>${xmlEscape(String(text))}</${tag}>`;

// ---------------------------------------------------------------- KML

/** KML colour aabbggrr from '#rrggbb' and an opacity 0…1 (KML 2.2 §16.9 kml:color). */
function kmlColor(hex: string, alpha = 1): string {
  const a = Math.round(alpha * 255)
    .toString(16)
    .padStart(2, '0');
  return `${a}${hex.slice(5, 7)}${hex.slice(3, 5)}${hex.slice(1, 3)}`;
}

// Seedfall's own palette.
const STYLES: Record<string, string> = {
  'sf-site': `<IconStyle><color>${kmlColor('#1b6e5a')}</color><scale>1.1</scale></IconStyle>`,
  'sf-release': `<IconStyle><color>${kmlColor('#c2410c')}</color><scale>0.9</scale></IconStyle>`,
  'sf-landing': `<IconStyle><color>${kmlColor('#6b7280')}</color><scale>0.6</scale></IconStyle>`,
  'sf-ellipse50': `<LineStyle><color>${kmlColor('#7c3aed')}</color><width>1</width></LineStyle><PolyStyle><color>${kmlColor('#7c3aed', 0.35)}</color></PolyStyle>`,
  'sf-ellipse95': `<LineStyle><color>${kmlColor('#7c3aed')}</color><width>1.5</width></LineStyle><PolyStyle><color>${kmlColor('#7c3aed', 0.12)}</color></PolyStyle>`,
  'sf-reach': `<LineStyle><color>${kmlColor('#0e7490')}</color><width>1.5</width></LineStyle><PolyStyle><color>${kmlColor('#0e7490', 0.06)}</color></PolyStyle>`,
  'sf-window': `<LineStyle><color>${kmlColor('#c2410c', 0.8)}</color><width>6</width></LineStyle>`,
  'sf-zone': `<LineStyle><color>${kmlColor('#c2410c')}</color><width>2</width></LineStyle><PolyStyle><color>${kmlColor('#c2410c', 0.08)}</color></PolyStyle>`,
  'sf-track': `<LineStyle><color>${kmlColor('#334155')}</color><width>2</width></LineStyle>`,
  'sf-hazard': `<LineStyle><color>${kmlColor('#b42318')}</color><width>2.5</width></LineStyle><PolyStyle><color>${kmlColor('#b42318', 0.08)}</color></PolyStyle>`,
};

const kmlCoords = (ps: Position[]): string => ps.map((p) => `${p[0]},${p[1]}`).join(' ');

function kmlGeometry(g: Geometry): string {
  switch (g.type) {
    case 'Point':
      return `<Point><coordinates>${kmlCoords([g.coordinates])}</coordinates></Point>`;
    case 'LineString':
      return `<LineString><tessellate>1</tessellate><coordinates>${kmlCoords(g.coordinates)}</coordinates></LineString>`;
    case 'Polygon': {
      const [outer, ...holes] = g.coordinates;
      const ring = (r: Position[]): string =>
        `<LinearRing><coordinates>${kmlCoords(r)}</coordinates></LinearRing>`;
      return `<Polygon><outerBoundaryIs>${ring(outer)}</outerBoundaryIs>${holes.map((h) => `<innerBoundaryIs>${ring(h)}</innerBoundaryIs>`).join('')}</Polygon>`;
    }
    default:
      return `<MultiGeometry>${g.coordinates.map((c) => kmlGeometry({ type: 'Polygon', coordinates: c })).join('')}</MultiGeometry>`;
  }
}

function placemark(
  name: string,
  description: string,
  style: string,
  data: Record<string, unknown>,
  g: Geometry,
): string {
  // Element order of kml:Placemark per the KML 2.2 schema: name, description, styleUrl, ExtendedData, Geometry.
  const ext = Object.entries(data)
    .filter(([, v]) => v !== undefined && v !== null)
    .map(([k, v]) => `<Data name="${xmlEscape(k)}"><value>${xmlEscape(String(v))}</value></Data>`)
    .join('');
  return `<Placemark>${el('name', name)}${el('description', description)}<styleUrl>#${style}</styleUrl><ExtendedData>${ext}</ExtendedData>${kmlGeometry(g)}</Placemark>`;
}

const FOLDERS: [string, string[]][] = [
  ['Sites', ['site']],
  ['Release points', ['release']],
  ['Landing ellipses', ['landing', 'ellipse50', 'ellipse95']],
  ['Reach areas', ['reach']],
  ['Release windows', ['window', 'zone']],
  ['Track', ['track']],
  ['Hazard area', ['hazard']],
];

const KIND_TITLE: Record<string, string> = {
  landing: 'uncontrolled landing',
  ellipse50: '50 % landing ellipse',
  ellipse95: '95 % landing ellipse',
  reach: 'reach area',
  window: 'release window',
  zone: 'hover release zone',
};

/** KML 2.2 document with one Folder per layer; numbers in ExtendedData and descriptions. */
export function toKML(plan: Plan, result: PlanResult, opts: GeoJSONOptions = {}): string {
  const fc = toGeoJSON(plan, result, opts);
  const byId = new Map(result.sites.map((s) => [s.id, s]));
  const body = FOLDERS.map(([title, kinds]) => {
    const marks = fc.features
      .filter((f) => kinds.includes(String(f.properties.kind)))
      .map((f) => {
        const p = f.properties;
        const kind = String(p.kind);
        const r = byId.get(String(p.site ?? p.id));
        if (kind === 'site' && r) {
          const text = `${r.name} (${r.id}): ${releaseText(r)}; tolerance ${String(p.tolerance_m)} m, elevation ${String(p.elevation_m)} m`;
          return placemark(r.name, text, 'sf-site', p, f.geometry);
        }
        if (kind === 'release' && r)
          return placemark(`R-${r.id}`, releaseText(r), 'sf-release', p, f.geometry);
        if (kind === 'hazard') {
          return placemark(
            'Hazard area — keep people clear',
            'hazard area of the plan',
            'sf-hazard',
            p,
            f.geometry,
          );
        }
        if (kind === 'track') {
          const text = `carrier track ${String(p.trackDeg)}° true at ${String(p.groundSpeed_mps)} m/s, ${signed(Number(p.from_s))} to ${signed(Number(p.to_s))} about the plan's release point`;
          return placemark('Carrier track', text, 'sf-track', p, f.geometry);
        }
        const text = Object.entries(p)
          .filter(([k]) => k !== 'kind')
          .map(([k, v]) => `${k} ${String(v)}`)
          .join(', ');
        return placemark(
          `${String(p.site)} ${KIND_TITLE[kind] ?? kind}`,
          text,
          `sf-${kind}`,
          p,
          f.geometry,
        );
      });
    return `<Folder>${el('name', title)}${marks.join('\n')}</Folder>`;
  });
  const styles = Object.entries(STYLES).map(([id, s]) => `<Style id="${id}">${s}</Style>`);
  const desc = `Seedfall plan, release ${result.time}; release altitude ${result.releaseAltitudeMSL_m.toFixed(1)} m MSL`;
  return [
    '<?xml version="1.0" encoding="UTF-8"?>',
    '<kml xmlns="http://www.opengis.net/kml/2.2">',
    `<Document>${el('name', result.name)}${el('description', desc)}`,
    ...styles,
    ...body,
    '</Document>',
    '</kml>',
    '',
  ].join('\n');
}

// ---------------------------------------------------------------- GPX

/** xsd:dateTime in UTC for plan time + offset_s, or undefined when the plan time is not a date. */
function utcAt(planTime: string, offset_s: number): string | undefined {
  const ms = Date.parse(planTime);
  if (!Number.isFinite(ms) || !Number.isFinite(offset_s)) return undefined;
  return new Date(ms + Math.round(offset_s * 1000)).toISOString();
}

// GPX 1.1 wptType sequence: ele, time, magvar, geoidheight, name, cmt, desc, src, link, sym, type, …
function wpt(
  tag: 'wpt' | 'rtept',
  p: LatLon,
  f: { ele?: number; time?: string; name: string; cmt?: string; desc?: string; type?: string },
): string {
  const parts = [`<${tag} lat="${r7(p.lat)}" lon="${r7(p.lon)}">`];
  if (f.ele !== undefined && Number.isFinite(f.ele)) parts.push(el('ele', round(f.ele, 2)));
  if (f.time) parts.push(el('time', f.time));
  parts.push(el('name', f.name));
  if (f.cmt) parts.push(el('cmt', f.cmt));
  if (f.desc) parts.push(el('desc', f.desc));
  if (f.type) parts.push(el('type', f.type));
  parts.push(`</${tag}>`);
  return parts.join('');
}

/** GPX 1.1 with a waypoint per release point (R-<id>) and per site, and the carrier track as a route. */
export function toGPX(plan: Plan, result: PlanResult): string {
  const lines = [
    '<?xml version="1.0" encoding="UTF-8"?>',
    '<gpx version="1.1" creator="Seedfall" xmlns="http://www.topografix.com/GPX/1/1" ' +
      'xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" ' +
      'xsi:schemaLocation="http://www.topografix.com/GPX/1/1 http://www.topografix.com/GPX/1/1/gpx.xsd">',
  ];
  const t0 = utcAt(result.time, 0);
  lines.push(
    `<metadata>${el('name', result.name)}${el('desc', `Seedfall drop plan; times are planned, relative to passing the plan's release point at ${result.time}`)}${t0 ? el('time', t0) : ''}</metadata>`,
  );
  for (const r of result.sites) {
    lines.push(
      wpt('wpt', r.release, {
        ele: result.releaseAltitudeMSL_m,
        time: utcAt(result.time, r.release.time_s),
        name: `R-${r.id}`,
        cmt: `release ${r.id} with ${r.variant}`,
        desc: releaseText(r),
        type: 'release',
      }),
    );
  }
  result.sites.forEach((r, i) => {
    const s = planSite(plan, result, i);
    lines.push(
      wpt('wpt', s, {
        ele: s.elevation_m,
        name: r.id,
        cmt: r.name,
        desc: `${r.name}; tolerance ${s.tolerance_m} m; variant ${r.variant}; P(hit) ${r.pHit.toFixed(2)}`,
        type: 'site',
      }),
    );
  });
  if (moving(result)) {
    const [from, to] = trackSpan(result);
    const pts = trackTimes(from, to).map((t) =>
      wpt('rtept', trackPoint(result, t), {
        ele: result.releaseAltitudeMSL_m,
        time: utcAt(result.time, t),
        name: `T${signed(t).replace(/ s$/, '').replace('−', '-')}`,
      }),
    );
    // rteType sequence: name, cmt, desc, src, link, number, type, extensions, rtept*.
    lines.push(
      `<rte>${el('name', 'Carrier track')}${el('desc', `${result.track.trackDeg}° true at ${result.track.groundSpeed_mps} m/s`)}`,
      ...pts,
      '</rte>',
    );
  }
  lines.push('</gpx>', '');
  return lines.join('\n');
}

// ---------------------------------------------------------------- CSV

const CSV_CONFIG = { newline: '\r\n', quotes: false } as const;

/** The UTF-8 byte-order mark (U+FEFF) that `bom: true` puts first. */
export const UTF8_BOM = '\uFEFF';

// OWASP "CSV Injection": a cell starting with =, +, -, @, tab or carriage return is read as a
// formula by spreadsheets; OWASP ASVS 5.0 V1.2.10 adds NUL.
const FORMULA_START = /^[=+\-@\t\r\0]/;

/**
 * A text cell made inert for spreadsheets: a single quote put before text that starts with
 * = + - @, tab, carriage return or NUL (OWASP CSV Injection). Other text is unchanged.
 */
export function neutraliseCell(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

/**
 * RFC 4180 text: papaparse quotes fields holding a comma, quote, CR or LF and doubles quotes;
 * every record ends CRLF. Text cells (ids, names) are neutralised; numbers the exporter writes
 * itself (a longitude of -12.5) are numbers, not text, and stay as they are.
 */
function csv(fields: string[], rows: unknown[][], opts: CsvOptions = {}): string {
  const data = rows.map((row) => row.map((c) => (typeof c === 'string' ? neutraliseCell(c) : c)));
  return (opts.bom ? UTF8_BOM : '') + Papa.unparse({ fields, data }, CSV_CONFIG) + '\r\n';
}

const blank = (x: number | null | undefined, d: number): number | string =>
  x === null || x === undefined || !Number.isFinite(x) ? '' : round(x, d);

function safeMGRS(p: LatLon): string {
  try {
    return toMGRS(p, 5);
  } catch {
    return ''; // outside MGRS's UTM latitudes (80°S–84°N)
  }
}

/**
 * Release schedule, one row per site in release order (by release time on a moving carrier,
 * else plan order). Times are s relative to passing the plan's release point. Empty cells mean
 * "not applicable" (no window, no heading programme, hovering). MGRS is empty outside 80°S–84°N.
 */
export function toScheduleCSV(plan: Plan, result: PlanResult, opts: ScheduleOptions = {}): string {
  const want = (k: 'decimal' | 'utm' | 'mgrs'): boolean =>
    opts.coords === undefined || opts.coords === k;
  const fields = [
    'order',
    'site',
    'name',
    'variant',
    ...(want('decimal') ? ['release_lat', 'release_lon'] : []),
    ...(want('utm') ? ['release_utm'] : []),
    ...(want('mgrs') ? ['release_mgrs'] : []),
    'release_altitude_agl_m',
    'release_altitude_msl_m',
    'carrier_track_deg',
    'window_open_s',
    'window_close_s',
    'best_s',
    'hover_zone_radius_m',
    'heading_true_deg',
    'heading_mag_deg',
    'thrust_s',
    'p_hit',
    'cep_m',
    'ellipse95_major_m',
    'ellipse95_minor_m',
    'ellipse95_azimuth_deg',
  ];
  const rows = [...result.sites];
  if (moving(result)) rows.sort((a, b) => a.release.time_s - b.release.time_s);
  const data = rows.map((r, i) => {
    const p = r.release;
    const w = r.releaseWindow;
    return [
      i + 1,
      r.id,
      r.name,
      r.variant,
      ...(want('decimal') ? [r7(p.lat), r7(p.lon)] : []),
      ...(want('utm') ? [formatUTM(p)] : []),
      ...(want('mgrs') ? [safeMGRS(p)] : []),
      round(result.releaseAltitudeMSL_m - plan.groundElevation_m, 1),
      round(result.releaseAltitudeMSL_m, 1),
      moving(result) ? result.track.trackDeg : '',
      blank(w?.open_s, 2),
      blank(w?.close_s, 2),
      blank(w?.best_s, 2),
      blank(r.releaseZone?.radius_m, 1),
      blank(r.headingTrue_deg, 1),
      blank(r.headingMag_deg, 1),
      blank(r.thrustTime_s, 2),
      round(r.pHit, 4),
      round(r.cep_m, 2),
      round(r.ellipse95.semiMajor_m, 2),
      round(r.ellipse95.semiMinor_m, 2),
      round(r.ellipse95.azimuth_deg, 1),
    ];
  });
  return csv(fields, data, opts);
}

/** The plan's sites as CSV (id, name, lat, lon, elevation_m, tolerance_m, variant), readable by importSites. */
export function toSitesCSV(plan: Plan, opts: CsvOptions = {}): string {
  const fields = ['id', 'name', 'lat', 'lon', 'elevation_m', 'tolerance_m', 'variant'];
  const data = plan.sites.map((s) => [
    s.id,
    s.name,
    r7(s.lat),
    r7(s.lon),
    s.elevation_m,
    s.tolerance_m,
    s.variant ?? '',
  ]);
  return csv(fields, data, opts);
}
