import { check } from '@placemarkio/check-geojson';
import { kml as kmlToGeoJSON } from '@tmcw/togeojson';
import { DOMParser } from '@xmldom/xmldom';
import { XMLParser } from 'fast-xml-parser';
import fc from 'fast-check';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../app/cli';
import {
  neutraliseCell,
  toGeoJSON,
  toGPX,
  toKML,
  toScheduleCSV,
  toSitesCSV,
  UTF8_BOM,
  type FeatureCollection,
  type Position,
} from '../../app/formats';
import { importSites } from '../../app/formats/import-sites';
import type { Plan } from '../../app/plan/plan';
import { hazardArea } from '../../app/safety/hazard-area';
import { planDrop, type PlanResult } from '../../app/planner';
import { validatePlan } from '../../app/plan/validate';
import { ellipseRing } from '../../app/map/geometry';
import demo from '../../data/demo-plan.json';
import { NOW, expectClose } from './helpers';

/** The demo plan with fewer Monte Carlo samples (speed); optionally hovering. */
function demoPlan(edit: (d: typeof demo) => unknown = (d) => d): Plan {
  const raw = JSON.parse(JSON.stringify(demo)) as typeof demo;
  raw.monteCarlo.samples = 300;
  const v = validatePlan(edit(raw), { now: NOW });
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  return v.plan;
}

let plan: Plan;
let result: PlanResult;
let hoverPlan: Plan;
let hoverResult: PlanResult;
beforeAll(() => {
  plan = demoPlan((d) => {
    d.sites[0].name = 'Reed, "North" margin & <edge>';
    return d;
  });
  result = planDrop(plan);
  hoverPlan = demoPlan((d) => {
    d.carrier.groundSpeed_mps = 0;
    d.sites = d.sites.slice(0, 3);
    return d;
  });
  hoverResult = planDrop(hoverPlan);
});

const xml = (text: string) => new DOMParser().parseFromString(text, 'text/xml');

/** Twice the signed area of a closed [lon, lat] ring (shoelace formula; > 0 = counter-clockwise). */
function shoelace(ring: Position[]): number {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++)
    s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return s;
}

const decimals = (x: number): number => (String(x).split('.')[1] ?? '').length;

describe('GeoJSON export', () => {
  it('is valid RFC 7946 GeoJSON by @placemarkio/check-geojson, moving and hovering', () => {
    // check() throws a HintError on any structural error (RFC 7946 validator, npm @placemarkio/check-geojson).
    expect(() => check(JSON.stringify(toGeoJSON(plan, result)))).not.toThrow();
    expect(() => check(JSON.stringify(toGeoJSON(hoverPlan, hoverResult)))).not.toThrow();
  });

  it('takes the safety module hazard area as the hazard feature and stays valid', () => {
    const fcH = toGeoJSON(plan, result, { hazardArea: hazardArea(result, 20).feature });
    const h = fcH.features.filter((f) => f.properties.kind === 'hazard');
    expect(h).toHaveLength(1);
    expect(h[0].properties.buffer_m).toBe(20);
    expect(() => check(JSON.stringify(fcH))).not.toThrow(); // @placemarkio/check-geojson
  });

  it('has closed counter-clockwise exterior rings (RFC 7946 §3.1.6 right-hand rule)', () => {
    const hazard = {
      type: 'Polygon' as const,
      // Clockwise on purpose, with a counter-clockwise hole: both must be re-wound.
      coordinates: [
        [
          [21.07, 47.49],
          [21.07, 47.5],
          [21.09, 47.5],
          [21.09, 47.49],
          [21.07, 47.49],
        ] as Position[],
        [
          [21.075, 47.492],
          [21.085, 47.492],
          [21.085, 47.498],
          [21.075, 47.498],
          [21.075, 47.492],
        ] as Position[],
      ],
    };
    for (const fc of [
      toGeoJSON(plan, result, { hazardArea: hazard }),
      toGeoJSON(hoverPlan, hoverResult),
    ]) {
      const polys = fc.features.filter((f) => f.geometry.type === 'Polygon');
      expect(polys.length).toBeGreaterThan(0);
      for (const f of polys) {
        if (f.geometry.type !== 'Polygon') continue;
        f.geometry.coordinates.forEach((ring, i) => {
          expect(ring.length).toBeGreaterThanOrEqual(4); // RFC 7946 §3.1.6: ≥ 4 positions
          expect(ring[ring.length - 1]).toEqual(ring[0]); // closed
          if (i === 0) expect(shoelace(ring), String(f.properties.kind)).toBeGreaterThan(0);
          else expect(shoelace(ring), 'hole').toBeLessThan(0);
        });
      }
    }
  });

  it('lists the features the brief names, with [lon, lat] order and 7 decimals', () => {
    const fc = toGeoJSON(plan, result, {
      hazardArea: {
        type: 'MultiPolygon',
        coordinates: [
          [
            [
              [21, 47],
              [21.01, 47],
              [21.01, 47.01],
              [21, 47],
            ],
          ],
        ],
      },
    });
    const kinds = (k: string) => fc.features.filter((f) => f.properties.kind === k);
    const n = plan.sites.length;
    expect(kinds('site')).toHaveLength(n);
    expect(kinds('release')).toHaveLength(n);
    expect(kinds('landing')).toHaveLength(n);
    expect(kinds('ellipse50')).toHaveLength(n);
    expect(kinds('ellipse95')).toHaveLength(n);
    expect(kinds('reach')).toHaveLength(result.sites.filter((s) => s.reachRadius_m > 0).length);
    expect(kinds('window')).toHaveLength(result.sites.filter((s) => s.releaseWindow).length);
    expect(kinds('track')).toHaveLength(1);
    expect(kinds('hazard')).toHaveLength(1);
    const site = kinds('site')[0];
    expect(site.geometry.coordinates).toEqual([plan.sites[0].lon, plan.sites[0].lat]);
    expect(site.properties).toMatchObject({
      id: 's01',
      variant: result.sites[0].variant,
      tolerance_m: 10,
      reachable: result.sites[0].reachable,
    });
    for (const f of fc.features) {
      const flat = JSON.stringify(f.geometry.coordinates).match(/-?\d+\.?\d*/g) ?? [];
      for (const x of flat) expect(decimals(Number(x))).toBeLessThanOrEqual(7);
    }
    const hover = toGeoJSON(hoverPlan, hoverResult);
    expect(hover.features.filter((f) => f.properties.kind === 'zone').length).toBe(
      hoverResult.sites.filter((s) => s.releaseZone).length,
    );
    expect(hover.features.some((f) => f.properties.kind === 'track')).toBe(false);
  });

  it('draws the 95 % ellipse on the same vertices as the map layer (app/map/geometry ellipseRing)', () => {
    const fc = toGeoJSON(plan, result);
    const e = result.sites[1].ellipse95;
    const f = fc.features.find(
      (x) => x.properties.kind === 'ellipse95' && x.properties.site === result.sites[1].id,
    );
    if (f?.geometry.type !== 'Polygon') throw new Error('no ellipse');
    const ours = f.geometry.coordinates[0];
    const map = ellipseRing(e.center, e.semiMajor_m, e.semiMinor_m, e.azimuth_deg, 72);
    expect(ours).toHaveLength(map.length);
    const mapSet = map.map(([lat, lon]) => [lon, lat]);
    for (const p of ours) {
      const d = Math.min(...mapSet.map((q) => Math.hypot(q[0] - p[0], q[1] - p[1])));
      expect(d).toBeLessThan(1e-7);
    }
  });
});

describe('KML export', () => {
  it('parses back through togeojson with every placemark and the sites within 1e-7°', () => {
    const text = toKML(plan, result);
    const doc = xml(text);
    expect(doc.documentElement?.namespaceURI).toBe('http://www.opengis.net/kml/2.2'); // OGC KML 2.2
    const placemarks = doc.getElementsByTagName('Placemark').length;
    const back = kmlToGeoJSON(doc);
    expect(back.features).toHaveLength(placemarks);
    expect(placemarks).toBe(toGeoJSON(plan, result).features.length);
    const folders = Array.from(doc.getElementsByTagName('Folder')).map(
      (f) => f.getElementsByTagName('name')[0]?.textContent,
    );
    expect(folders).toEqual([
      'Sites',
      'Release points',
      'Landing ellipses',
      'Reach areas',
      'Release windows',
      'Track',
      'Hazard area',
    ]);
    const sites = back.features.filter((f) => f.properties?.kind === 'site');
    expect(sites).toHaveLength(plan.sites.length);
    sites.forEach((f, i) => {
      if (f.geometry?.type !== 'Point') throw new Error('site is not a point');
      expectClose(f.geometry.coordinates[0], plan.sites[i].lon, 1e-7, 'lon');
      expectClose(f.geometry.coordinates[1], plan.sites[i].lat, 1e-7, 'lat');
    });
    // Text from the plan is escaped and comes back unchanged.
    expect(sites[0].properties?.name).toBe('Reed, "North" margin & <edge>');
  });

  it('carries the hazard area as a polygon placemark when given', () => {
    const doc = xml(toKML(plan, result, { hazardArea: hazardArea(result, 20).feature }));
    const back = kmlToGeoJSON(doc);
    const hz = back.features.filter((f) => f.properties?.kind === 'hazard');
    expect(hz).toHaveLength(1);
    expect(['Polygon', 'MultiPolygon', 'GeometryCollection']).toContain(hz[0].geometry?.type);
  });

  it('uses aabbggrr colours on its own styles (KML 2.2 kml:color)', () => {
    const doc = xml(toKML(plan, result));
    for (const c of Array.from(doc.getElementsByTagName('color')))
      expect(c.textContent).toMatch(/^[0-9a-f]{8}$/);
    const styleIds = new Set(
      Array.from(doc.getElementsByTagName('Style')).map((s) => `#${s.getAttribute('id')}`),
    );
    for (const u of Array.from(doc.getElementsByTagName('styleUrl')))
      expect(styleIds.has(u.textContent ?? '')).toBe(true);
  });
});

// GPX 1.1 schema, topografix.com/GPX/1/1/gpx.xsd, wptType: the child element sequence.
const WPT_ORDER = [
  'ele',
  'time',
  'magvar',
  'geoidheight',
  'name',
  'cmt',
  'desc',
  'src',
  'link',
  'sym',
  'type',
  'fix',
  'sat',
  'hdop',
  'vdop',
  'pdop',
  'ageofdgpsdata',
  'dgpsid',
  'extensions',
];

type Ordered = Record<string, unknown> & { ':@'?: Record<string, string> };
const tagOf = (n: Ordered): string => Object.keys(n).find((k) => k !== ':@') ?? '';

describe('GPX export', () => {
  it('is GPX 1.1 with namespace, points in range and wptType child order', () => {
    for (const [p, r] of [
      [plan, result],
      [hoverPlan, hoverResult],
    ] as const) {
      const text = toGPX(p, r);
      const parsed = new XMLParser({
        ignoreAttributes: false,
        attributeNamePrefix: '',
        preserveOrder: true,
      }).parse(text) as Ordered[];
      const gpx = parsed.find((n) => tagOf(n) === 'gpx');
      if (!gpx) throw new Error('no gpx root');
      expect(gpx[':@']).toMatchObject({
        version: '1.1',
        creator: 'Seedfall',
        xmlns: 'http://www.topografix.com/GPX/1/1',
      });
      const children = gpx.gpx as Ordered[];
      const points: Ordered[] = children.filter((n) => tagOf(n) === 'wpt');
      for (const rte of children.filter((n) => tagOf(n) === 'rte'))
        points.push(...(rte.rte as Ordered[]).filter((n) => tagOf(n) === 'rtept'));
      expect(children.filter((n) => tagOf(n) === 'wpt')).toHaveLength(2 * p.sites.length);
      expect(children.filter((n) => tagOf(n) === 'rte')).toHaveLength(
        r.track.groundSpeed_mps > 0 ? 1 : 0,
      );
      for (const w of points) {
        const lat = Number(w[':@']?.lat);
        const lon = Number(w[':@']?.lon);
        // gpx.xsd latitudeType [-90, 90], longitudeType [-180, 180).
        expect(lat).toBeGreaterThanOrEqual(-90);
        expect(lat).toBeLessThanOrEqual(90);
        expect(lon).toBeGreaterThanOrEqual(-180);
        expect(lon).toBeLessThan(180);
        const order = (w[tagOf(w)] as Ordered[]).map(tagOf).map((t) => WPT_ORDER.indexOf(t));
        expect(order.every((x) => x >= 0)).toBe(true);
        expect([...order].sort((a, b) => a - b)).toEqual(order);
      }
      const wpts = children.filter((n) => tagOf(n) === 'wpt');
      const names = wpts.map((w) => {
        const nameNode = (w.wpt as Ordered[]).find((c) => tagOf(c) === 'name');
        return String((nameNode?.name as Ordered[])[0]['#text']);
      });
      for (const s of p.sites) {
        expect(names).toContain(`R-${s.id}`);
        expect(names).toContain(s.id);
      }
    }
  });

  it('gives each site waypoint its elevation and escapes text', () => {
    const doc = xml(toGPX(plan, result));
    const site = Array.from(doc.getElementsByTagName('wpt')).find(
      (w) => w.getElementsByTagName('name')[0]?.textContent === 's01',
    );
    expect(Number(site?.getElementsByTagName('ele')[0]?.textContent)).toBe(89.4);
    expect(site?.getElementsByTagName('cmt')[0]?.textContent).toBe('Reed, "North" margin & <edge>');
  });

  it('routes the track from at least −60 s to +60 s around the release point', () => {
    const doc = xml(toGPX(plan, result));
    const names = Array.from(doc.getElementsByTagName('rtept')).map(
      (r) => r.getElementsByTagName('name')[0]?.textContent ?? '',
    );
    const times = names.map((n) => Number(n.slice(1)));
    expect(Math.min(...times)).toBeLessThanOrEqual(-60);
    expect(Math.max(...times)).toBeGreaterThanOrEqual(60);
    for (const s of result.sites) {
      if (!s.releaseWindow) continue;
      expect(Math.min(...times)).toBeLessThanOrEqual(s.releaseWindow.open_s);
      expect(Math.max(...times)).toBeGreaterThanOrEqual(s.releaseWindow.close_s);
    }
  });
});

describe('schedule CSV', () => {
  it('ends every record with CRLF and parses back to the same numbers (RFC 4180 §2)', () => {
    const text = toScheduleCSV(plan, result);
    // RFC 4180 §2.1: records end with CRLF; a line feed never appears without its CR here.
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
    const back = Papa.parse<Record<string, string>>(text.trimEnd(), { header: true });
    expect(back.errors).toEqual([]);
    expect(back.data).toHaveLength(plan.sites.length);
    const times = back.data.map((r) => result.sites.find((s) => s.id === r.site)!.release.time_s);
    expect([...times].sort((a, b) => a - b)).toEqual(times); // release order on a moving carrier
    for (const row of back.data) {
      const r = result.sites.find((s) => s.id === row.site)!;
      expectClose(Number(row.release_lat), r.release.lat, 5e-8, 'lat');
      expectClose(Number(row.release_lon), r.release.lon, 5e-8, 'lon');
      expectClose(Number(row.p_hit), r.pHit, 5e-5, 'p_hit');
      expectClose(Number(row.cep_m), r.cep_m, 5e-3, 'cep');
      expectClose(Number(row.ellipse95_major_m), r.ellipse95.semiMajor_m, 5e-3, 'major');
      if (r.releaseWindow) expectClose(Number(row.window_open_s), r.releaseWindow.open_s, 5e-3);
      else expect(row.window_open_s).toBe('');
      expect(row.release_altitude_msl_m).toBe(String(result.releaseAltitudeMSL_m));
    }
  });

  // Binomial standard error of a share p of n independent samples, √(p(1−p)/n) (any statistics
  // text; common practice for Monte Carlo estimates): recomputed here from the exported p_hit.
  it('carries the standard error of P(hit) beside it in the schedule, GeoJSON and KML', () => {
    const n = plan.monteCarlo.samples;
    const binomialSE = (p: number) => Math.sqrt((p * (1 - p)) / n);
    const back = Papa.parse<Record<string, string>>(toScheduleCSV(plan, result).trimEnd(), {
      header: true,
    });
    const fields = back.meta.fields ?? [];
    expect(fields.indexOf('p_hit_se')).toBe(fields.indexOf('p_hit') + 1);
    for (const row of back.data) {
      // Both are rounded to 4 decimals (±5e-5 each); p is a multiple of 1/n, so p(1−p)n ≥ 1 − 1/n
      // and the SE's slope |1−2p|/(2√(p(1−p)n)) is under 1: 1e-4 covers both roundings.
      expectClose(Number(row.p_hit_se), binomialSE(Number(row.p_hit)), 1e-4, `se ${row.site}`);
    }
    const sites = toGeoJSON(plan, result).features.filter((f) => f.properties.kind === 'site');
    for (const f of sites) {
      const p = f.properties as { pHit: number; pHitSE: number };
      expectClose(p.pHitSE, binomialSE(p.pHit), 1e-4, 'geojson pHitSE');
    }
    expect(toKML(plan, result)).toMatch(/<Data name="pHitSE"><value>0\.\d+<\/value><\/Data>/);
    // The descriptions a person reads say it too: "P(hit) 0.91 ± 0.01" (or "± <0.01").
    expect(toGPX(plan, result)).toMatch(/P\(hit\) \d\.\d\d ± (<0\.01|0\.\d\d)/);
  });

  it('says per site whether its variant meets P(hit), is the best below it, or none can reach', () => {
    const back = Papa.parse<Record<string, string>>(toScheduleCSV(plan, result).trimEnd(), {
      header: true,
    });
    expect(back.meta.fields?.indexOf('recommendation')).toBe(
      (back.meta.fields?.indexOf('variant') ?? -2) + 1,
    );
    for (const row of back.data) {
      const r = result.sites.find((s) => s.id === row.site)!;
      expect(row.recommendation).toBe(r.recommendation.kind);
      expect(['meets', 'below', 'unreachable']).toContain(row.recommendation);
    }
    const sites = toGeoJSON(plan, result).features.filter((f) => f.properties.kind === 'site');
    for (const f of sites) {
      const r = result.sites.find((s) => s.id === f.properties.id)!;
      expect(f.properties.recommendation).toBe(r.recommendation.kind);
      expect(f.properties.recommendationWhy).toBe(r.recommendation.why);
    }
  });

  it('round-trips a name with a comma and a quote (RFC 4180 §2.6–2.7)', () => {
    const text = toScheduleCSV(plan, result);
    expect(text).toContain('"Reed, ""North"" margin & <edge>"');
    const back = Papa.parse<Record<string, string>>(text.trimEnd(), { header: true });
    expect(back.data.find((r) => r.site === 's01')?.name).toBe('Reed, "North" margin & <edge>');
  });

  it('keeps plan order when hovering and writes only the chosen coordinate columns', () => {
    const text = toScheduleCSV(hoverPlan, hoverResult, { coords: 'mgrs' });
    const back = Papa.parse<Record<string, string>>(text.trimEnd(), { header: true });
    expect(back.data.map((r) => r.site)).toEqual(hoverPlan.sites.map((s) => s.id));
    expect(back.meta.fields).toContain('release_mgrs');
    expect(back.meta.fields).not.toContain('release_lat');
    expect(back.meta.fields).not.toContain('release_utm');
    for (const r of back.data) expect(r.release_mgrs).toMatch(/^\d{1,2}[C-X][A-Z]{2}\d{10}$/);
  });
});

describe('round trips through importSites', () => {
  const same = (sites: ReturnType<typeof importSites>['sites'], p: Plan): void => {
    expect(sites.map((s) => s.id)).toEqual(p.sites.map((s) => s.id));
    sites.forEach((s, i) => {
      const want = p.sites[i];
      expectClose(s.lat, want.lat, 1e-7, `${want.id} lat`);
      expectClose(s.lon, want.lon, 1e-7, `${want.id} lon`);
      expect(s.elevation_m).toBe(want.elevation_m);
      expect(s.tolerance_m).toBe(want.tolerance_m);
      expect(s.name ?? s.id).toBe(want.name);
      expect(s.variant).toBe(want.variant);
    });
  };

  it('GeoJSON export → importSites gives the same sites; result features are reported', () => {
    const fc: FeatureCollection = toGeoJSON(plan, result);
    const r = importSites(JSON.stringify(fc), 'geojson');
    same(r.sites, plan);
    for (const pr of r.problems) expect(pr.message).toMatch(/planned result, not a site/);
    const reported = r.problems.reduce((n, pr) => n + Number(/\((\d+)\)/.exec(pr.message)?.[1]), 0);
    expect(reported + r.sites.length).toBe(fc.features.length); // nothing silently dropped
  });

  it('KML export → importSites gives the same sites', () => {
    const r = importSites(toKML(plan, result), 'auto');
    same(r.sites, plan);
    for (const pr of r.problems) expect(pr.message).toMatch(/planned result, not a site/);
  });

  it('sites CSV → importSites gives the same sites with no problems', () => {
    const r = importSites(toSitesCSV(plan), 'auto');
    expect(r.problems).toEqual([]);
    same(r.sites, plan);
  });
});

describe('CSV cells and spreadsheets', () => {
  // OWASP "CSV Injection": cells starting with =, +, -, @, tab or carriage return are read as
  // formulas; prefix them with a single quote. OWASP ASVS 5.0 V1.2.10 lists NUL as well.
  const TRIGGERS = ['=', '+', '-', '@', '\t', '\r', '\0'];
  const hostile = [
    '=HYPERLINK("http://example.invalid","x")',
    '+1+1',
    '-2+3',
    '@SUM(A1:A2)',
    '\t=1',
    '\r=1',
  ];

  function hostilePlan(): Plan {
    return demoPlan((d) => {
      d.sites = d.sites.slice(0, hostile.length);
      d.sites.forEach((s, i) => (s.name = hostile[i]));
      d.sites[0].id = '=cmd';
      d.sites[1].id = '-north';
      return d;
    });
  }

  it('puts a single quote before names and ids that start a formula (OWASP CSV Injection)', () => {
    const p = hostilePlan();
    const back = Papa.parse<Record<string, string>>(toSitesCSV(p).trimEnd(), { header: true });
    expect(back.errors).toEqual([]);
    expect(back.data.map((r) => r.name)).toEqual(hostile.map((h) => `'${h}`));
    expect(back.data[0].id).toBe("'=cmd");
    expect(back.data[1].id).toBe("'-north");
    for (const row of back.data) {
      for (const cell of Object.values(row)) {
        expect(TRIGGERS.includes(cell.charAt(0)), `cell ${JSON.stringify(cell)}`).toBe(false);
      }
    }
  });

  it('reads the guarded names and ids back unchanged through importSites', () => {
    const p = hostilePlan();
    const r = importSites(toSitesCSV(p, { bom: true }), 'auto');
    expect(r.sites.map((x) => x.id)).toEqual(p.sites.map((x) => x.id));
    // Names keep their text; the importer trims blanks and reads a lone CR as a line break, so
    // the last name (it starts with CR) is left out here.
    const names = (xs: { name?: string }[]) => xs.slice(0, -1).map((x) => x.name!.trim());
    expect(names(r.sites)).toEqual(names(p.sites));
  });

  it('neutralises the schedule too but leaves negative numbers it writes as numbers', () => {
    const p = hostilePlan();
    const r = planDrop(p);
    const text = toScheduleCSV(p, r);
    const back = Papa.parse<Record<string, string>>(text.trimEnd(), { header: true });
    expect(back.data.map((row) => row.name).sort()).toEqual(hostile.map((h) => `'${h}`).sort());
    // Window times before passing the release point are negative numbers, written bare.
    const opens = back.data.map((row) => row.window_open_s).filter((c) => c !== '');
    expect(opens.some((c) => c.startsWith('-'))).toBe(true);
    for (const c of opens) expect(Number.isFinite(Number(c)), c).toBe(true);
  });

  it('neutralises any text and changes nothing else (property, fast-check)', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 12 }), (text) => {
        const out = neutraliseCell(text);
        if (TRIGGERS.includes(text.charAt(0))) expect(out).toBe(`'${text}`);
        else expect(out).toBe(text);
      }),
    );
  });

  it('starts with the UTF-8 byte-order mark EF BB BF only when asked (Unicode 15, §23.8)', () => {
    const p = demoPlan((d) => {
      d.sites[0].name = 'Rétköz szél';
      return d;
    });
    const plain = toSitesCSV(p);
    const marked = toSitesCSV(p, { bom: true });
    expect(plain.startsWith('id,')).toBe(true);
    expect([...Buffer.from(marked, 'utf8').subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    expect(marked).toBe(UTF8_BOM + plain);
    expect(toScheduleCSV(p, result, { bom: true })).toBe(UTF8_BOM + toScheduleCSV(p, result));
  });

  it('writes the byte-order mark from the command line with export --bom, for CSV only', async () => {
    const out: string[] = [];
    const err: string[] = [];
    const io = { out: (t: string) => void out.push(t), err: (t: string) => void err.push(t) };
    const args = ['export', 'data/demo-plan.json', '--samples', '100'];
    expect(await runCli([...args, '--format', 'csv', '--bom'], io)).toBe(0);
    expect(out.join('').startsWith(`${UTF8_BOM}order,site,`)).toBe(true);
    expect(await runCli([...args, '--format', 'geojson', '--bom'], io)).toBe(1);
    expect(err.join('')).toContain('--bom applies to --format csv only');
  }, 120_000);
});
