import { DOMParser } from '@xmldom/xmldom';
import fc from 'fast-check';
import * as mgrsModule from 'mgrs';
import proj4 from 'proj4';
import { describe, expect, it } from 'vitest';
import demo from '../../data/demo-plan.json';
import {
  MAX_IMPORT_BYTES,
  MAX_LISTED_PROBLEMS,
  schemaBounds,
  schemaMaxItems,
} from '../../app/formats/import-limits';
import { importSites, type ImportResult } from '../../app/formats/import-sites';
import type { PlanFile } from '../../app/plan/plan';
import { FRAME_LIMIT_M } from '../../app/plan/plan-limits';
import { allowedRange, validatePlan } from '../../app/plan/validate';
import { expectClose } from './helpers';

// mgrs ships CommonJS to Node (default export only) and ESM to bundlers.
const mgrs = ('toPoint' in mgrsModule ? mgrsModule : Reflect.get(mgrsModule, 'default')) as {
  toPoint: (s: string) => [number, number];
  forward: (p: [number, number], precision?: number) => string;
};

const lines = (r: ImportResult): (number | undefined)[] => r.problems.map((p) => p.line);

describe('CSV import', () => {
  it('reads a semicolon file with decimal commas and a quoted name holding the delimiter', () => {
    const text =
      'id;name;lat;lon;elevation_m;tolerance_m\n' + 'a1;"Reed; north";47,4929;21,0809;89,4;10\n';
    const r = importSites(text, 'csv');
    expect(r.problems).toEqual([]);
    expect(r.sites).toEqual([
      {
        id: 'a1',
        name: 'Reed; north',
        lat: 47.4929,
        lon: 21.0809,
        elevation_m: 89.4,
        tolerance_m: 10,
      },
    ]);
  });

  it('reads a headerless semicolon file with decimal commas', () => {
    const r = importSites('47,49;21,08\r\n-12,5;-45,25\r\n', 'auto');
    expect(r.problems).toEqual([]);
    expect(r.sites).toEqual([
      { id: 's01', lat: 47.49, lon: 21.08 },
      { id: 's02', lat: -12.5, lon: -45.25 },
    ]);
  });

  it('reads tab-separated files', () => {
    const r = importSites('site\tlatitude\tlongitude\nt1\t47.5\t21.1\nt2\t-33.9\t151.2\n', 'auto');
    expect(r.problems).toEqual([]);
    expect(r.sites.map((s) => [s.id, s.lat, s.lon])).toEqual([
      ['t1', 47.5, 21.1],
      ['t2', -33.9, 151.2],
    ]);
  });

  it('handles a BOM, CRLF, quoted commas, blank lines and a trailing delimiter', () => {
    // RFC 4180 §2.6: fields containing commas are enclosed in double quotes. // common practice: BOM from spreadsheets
    const text =
      '\uFEFFID,Name,Lat,Lon,\r\n' +
      'b1,"Oxbow, west bank",47.5,21.1,\r\n' +
      '\r\n' +
      'b2,"Say ""hi""",47.6,21.2,\r\n' +
      '   \r\n';
    const r = importSites(text, 'auto');
    expect(r.problems).toEqual([]);
    expect(r.sites).toEqual([
      { id: 'b1', name: 'Oxbow, west bank', lat: 47.5, lon: 21.1 },
      { id: 'b2', name: 'Say "hi"', lat: 47.6, lon: 21.2 },
    ]);
  });

  it('reads headerless lat,lon and id,lat,lon files, generating ids that avoid existing ones', () => {
    const a = importSites('47.5,21.1\n47.6,21.2\n', 'csv', { existingIds: ['s01', 's03'] });
    expect(a.problems).toEqual([]);
    expect(a.sites.map((s) => s.id)).toEqual(['s02', 's04']);
    expect(a.sites[1]).toMatchObject({ lat: 47.6, lon: 21.2 });
    const b = importSites('p1,47.5,21.1\np2,47.6,21.2\n', 'csv');
    expect(b.problems).toEqual([]);
    expect(b.sites.map((s) => [s.id, s.lat, s.lon])).toEqual([
      ['p1', 47.5, 21.1],
      ['p2', 47.6, 21.2],
    ]);
  });

  it('reads degrees-minutes-seconds in the lat and lon columns', () => {
    const text = 'id,lat,lon\nd1,47°29′34.3″N,21°04′51.3″E\nd2,"33 52 04.2 S","151 12 36.0 E"\n';
    const r = importSites(text, 'csv');
    expect(r.problems).toEqual([]);
    // DMS to decimal: d + m/60 + s/3600, negative in the south and west (common practice).
    expectClose(r.sites[0].lat, 47 + 29 / 60 + 34.3 / 3600, 1e-12, 'd1 lat');
    expectClose(r.sites[0].lon, 21 + 4 / 60 + 51.3 / 3600, 1e-12, 'd1 lon');
    expectClose(r.sites[1].lat, -(33 + 52 / 60 + 4.2 / 3600), 1e-12, 'd2 lat');
    expectClose(r.sites[1].lon, 151 + 12 / 60 + 36 / 3600, 1e-12, 'd2 lon');
  });

  it('reads UTM columns (zone with band, or a hemisphere column) as proj4 inverts them', () => {
    const utm34N = proj4('WGS84', '+proj=utm +zone=34 +ellps=WGS84 +datum=WGS84 +units=m +no_defs');
    const utm56S = proj4(
      'WGS84',
      '+proj=utm +zone=56 +south +ellps=WGS84 +datum=WGS84 +units=m +no_defs',
    );
    const text =
      'id,easting,northing,zone\n' + 'u1,505946,5259953,34T\n' + 'u2,505946,5259953,34S\n';
    const r = importSites(text, 'csv');
    // Reference: proj4's UTM inverse, called directly here.
    const [lon, lat] = utm34N.inverse([505946, 5259953]);
    expectClose(r.sites[0].lat, lat, 1e-9, 'u1 lat');
    expectClose(r.sites[0].lon, lon, 1e-9, 'u1 lon');
    // Band S is 32°N–40°N: the northing contradicts it, so the row is reported, not guessed.
    expect(r.sites).toHaveLength(1);
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0].line).toBe(3);
    expect(r.problems[0].message).toMatch(/^line 3: UTM band S/);

    const h = importSites('id,easting,northing,zone,hemisphere\nh1,334000,6250000,56,S\n', 'csv');
    expect(h.problems).toEqual([]);
    const [lon2, lat2] = utm56S.inverse([334000, 6250000]);
    expectClose(h.sites[0].lat, lat2, 1e-9, 'h1 lat');
    expectClose(h.sites[0].lon, lon2, 1e-9, 'h1 lon');
  });

  it('reads an MGRS column as the mgrs package decodes it', () => {
    const text = 'id,mgrs\nm1,34TET0594559953\nm2,"34T ET 05968 59961"\n';
    const r = importSites(text, 'csv');
    expect(r.problems).toEqual([]);
    // Reference: mgrs.toPoint (npm mgrs) gives the square's centre as [lon, lat].
    const [lon, lat] = mgrs.toPoint('34TET0594559953');
    expectClose(r.sites[0].lat, lat, 1e-12, 'm1 lat');
    expectClose(r.sites[0].lon, lon, 1e-12, 'm1 lon');
    const [lon2, lat2] = mgrs.toPoint('34TET0596859961');
    expectClose(r.sites[1].lat, lat2, 1e-12, 'm2 lat');
    expectClose(r.sites[1].lon, lon2, 1e-12, 'm2 lon');
  });

  it('reports each bad row with its line number and the reason, and keeps the good rows', () => {
    const text = [
      'id,name,lat,lon,elevation,tolerance', // 1
      'g1,Good one,47.5,21.1,90,10', // 2
      'x1,Too far north,95.2,21.1,,', // 3
      'x2,Text in lat,abc,21.1', // 4
      '', // 5
      'x3,Too few', // 6
      'g2,"Good, two",47.6,21.2', // 7
      'x4,Bad elevation,47.7,21.3,high', // 8
      'x5,No coordinates,,', // 9
      'x6,Lon out,47.1,200.5', // 10
      'x7,Bad tolerance,47.1,20.5,,-3', // 11
      'g1,Duplicate id,47.2,21.2', // 12
    ].join('\n');
    const r = importSites(text, 'csv');
    expect(r.sites.map((s) => s.id)).toEqual(['g1', 'g2', 's01']);
    expect(r.sites[1].name).toBe('Good, two');
    expect(lines(r)).toEqual([3, 4, 6, 8, 9, 10, 11, 12]);
    const msg = r.problems.map((p) => p.message);
    // WGS 84 latitude −90…90°, longitude −180…180° (NIMA TR8350.2); the message names the plan field.
    expect(msg[0]).toBe(
      "line 3: lat 95.2 is outside the plan's range (a number between -90 and 90); row not imported",
    );
    expect(msg[1]).toMatch(/^line 4: latitude "abc" is not a number/);
    expect(msg[2]).toMatch(/^line 6: only 2 field\(s\)/);
    expect(msg[3]).toMatch(/^line 8: elevation_m "high" is not a number/);
    expect(msg[4]).toBe('line 9: no coordinates; row not imported');
    expect(msg[5]).toMatch(
      /^line 10: lon 200.5 is outside the plan's range \(a number between -180 and 180\)/,
    );
    // The range is the schema's own, whatever it is today.
    expect(msg[6]).toBe(
      `line 11: tolerance_m -3 is outside the plan's range (${allowedRange('sites[0].tolerance_m')}); row not imported`,
    );
    expect(msg[7]).toBe('line 12: id "g1" is already taken; imported as "s01"');
  });

  it('counts lines across quoted line breaks', () => {
    const r = importSites('id,name,lat,lon\na,"two\nlines",47,21\nb,x,91,21\n', 'csv');
    expect(r.sites).toHaveLength(1);
    expect(r.sites[0].name).toBe('two\nlines');
    expect(lines(r)).toEqual([4]);
  });

  it('names unused columns and a header without coordinates', () => {
    const a = importSites('id,lat,lon,colour\na,47,21,red\n', 'csv');
    expect(a.sites).toHaveLength(1);
    expect(a.problems).toEqual([
      {
        line: 1,
        message: 'line 1: column(s) "colour" not recognised; their values are not imported',
      },
    ]);
    const b = importSites('id,where\na,somewhere\n', 'csv');
    expect(b.sites).toEqual([]);
    expect(b.problems[0].message).toMatch(/^line 1: header has no coordinate columns/);
  });
});

describe('GeoJSON import', () => {
  it('takes Point and MultiPoint features, reports a LineString by index', () => {
    const text = JSON.stringify({
      type: 'FeatureCollection',
      features: [
        {
          type: 'Feature',
          properties: {
            id: 'g1',
            name: 'Point one',
            elevation_m: 90,
            tolerance_m: 12,
            variant: 'vane-steer',
          },
          geometry: { type: 'Point', coordinates: [21.1, 47.5] },
        },
        {
          type: 'Feature',
          properties: { name: 'A line' },
          geometry: {
            type: 'LineString',
            coordinates: [
              [21, 47],
              [21.1, 47.1],
            ],
          },
        },
        {
          type: 'Feature',
          properties: { id: 'm' },
          geometry: {
            type: 'MultiPoint',
            coordinates: [
              [21.2, 47.2],
              [21.3, 47.3],
            ],
          },
        },
        { type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: [21, 95] } },
        { type: 'Feature', properties: { id: 'n' }, geometry: null },
      ],
    });
    const r = importSites(text, 'auto');
    expect(r.sites).toEqual([
      {
        id: 'g1',
        name: 'Point one',
        lat: 47.5,
        lon: 21.1,
        elevation_m: 90,
        tolerance_m: 12,
        variant: 'vane-steer',
      },
      { id: 'm-1', lat: 47.2, lon: 21.2 },
      { id: 'm-2', lat: 47.3, lon: 21.3 },
    ]);
    expect(r.problems.map((p) => p.feature)).toEqual([1, 3, 4]);
    expect(r.problems[0].message).toMatch(/^features\[1\]: a LineString is not a site/);
    expect(r.problems[1].message).toMatch(/lat 95 is outside the plan's range/);
    expect(r.problems[2].message).toMatch(/has no geometry/);
  });

  it('accepts a bare geometry and reports JSON syntax errors', () => {
    expect(importSites('{"type":"Point","coordinates":[8,47]}', 'auto').sites).toEqual([
      { id: 's01', lat: 47, lon: 8 },
    ]);
    const bad = importSites('{\n"type": "FeatureCollection",\n"features": [,]\n}', 'geojson');
    expect(bad.sites).toEqual([]);
    expect(bad.problems[0].message).toMatch(/not valid JSON/);
  });
});

describe('KML import', () => {
  it('reads two placemarks (OGC KML 2.2 Point coordinates are lon,lat[,alt])', () => {
    const text = `<?xml version="1.0" encoding="UTF-8"?>
<kml xmlns="http://www.opengis.net/kml/2.2"><Document>
  <Placemark><name>Reed &amp; Sedge</name><Point><coordinates>21.0809,47.4929,0</coordinates></Point></Placemark>
  <Placemark><name>k2</name>
    <ExtendedData><Data name="elevation_m"><value>88.5</value></Data><Data name="tolerance_m"><value>15</value></Data></ExtendedData>
    <Point><coordinates> 21.0811,47.4927 </coordinates></Point></Placemark>
  <Placemark><name>Path</name><LineString><coordinates>21,47 21.1,47.1</coordinates></LineString></Placemark>
</Document></kml>`;
    const r = importSites(text, 'auto');
    expect(r.sites).toEqual([
      { id: 'Reed & Sedge', lat: 47.4929, lon: 21.0809 },
      { id: 'k2', lat: 47.4927, lon: 21.0811, elevation_m: 88.5, tolerance_m: 15 },
    ]);
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0]).toMatchObject({ feature: 2 });
    expect(r.problems[0].message).toMatch(/LineString is not a site/);
  });

  it('reports malformed XML with its line and a non-KML root', () => {
    const bad = importSites('<kml>\n<Document>\n<Placemark></Document>\n</kml>', 'kml');
    expect(bad.sites).toEqual([]);
    expect(bad.problems[0].line).toBe(3);
    expect(bad.problems[0].message).toMatch(/^line 3: XML error/);
    const gpx = importSites('<gpx version="1.1"></gpx>', 'auto');
    expect(gpx.problems[0].message).toMatch(/root element <gpx> is not <kml>/);
  });

  it('uses an injected XML parser', () => {
    let called = 0;
    const r = importSites(
      '<kml><Placemark><name>i</name><Point><coordinates>1,2</coordinates></Point></Placemark></kml>',
      'kml',
      {
        parseXml: (t) => {
          called++;
          return new DOMParser().parseFromString(t, 'text/xml') as unknown as Document;
        },
      },
    );
    expect(called).toBe(1);
    expect(r.sites).toEqual([{ id: 'i', lat: 2, lon: 1 }]);
  });
});

describe('import never throws', () => {
  // Property: for any text and any kind, importSites returns; every site it returns is in range.
  it('on arbitrary strings, and every site is within −90…90, −180…180', () => {
    const kinds = fc.constantFrom(
      'csv' as const,
      'geojson' as const,
      'kml' as const,
      'auto' as const,
    );
    const texty = fc.oneof(
      fc.string({ unit: 'grapheme', maxLength: 200 }),
      fc
        .tuple(
          fc.array(
            fc.array(fc.oneof(fc.double(), fc.string(), fc.constantFrom('47,5', '°', '"', 'N')), {
              maxLength: 5,
            }),
            { maxLength: 6 },
          ),
          fc.constantFrom(',', ';', '\t'),
        )
        .map(([rows, d]) => rows.map((r) => r.join(d)).join('\n')),
      fc.string({ maxLength: 100 }).map((s) => `<kml>${s}</kml>`),
      fc.string({ maxLength: 100 }).map((s) => `{"type":"FeatureCollection","features":[${s}]}`),
    );
    fc.assert(
      fc.property(texty, kinds, (text, kind) => {
        const r = importSites(text, kind);
        for (const s of r.sites) {
          expect(Number.isFinite(s.lat) && Math.abs(s.lat) <= 90).toBe(true);
          expect(Number.isFinite(s.lon) && Math.abs(s.lon) <= 180).toBe(true);
          expect(s.id.length).toBeGreaterThan(0);
        }
        for (const p of r.problems) expect(typeof p.message).toBe('string');
      }),
      { numRuns: 400 },
    );
  });
});

describe('site import limits (the importers’ one rule, docs/plan-format.md)', () => {
  // The plan schema's own limits, read at run time so the tests follow the schema.
  const MAX = schemaMaxItems('sites');
  const onlyFirst = /only the first ([\d,]+) sites were read \(the plan holds at most ([\d,]+)/;

  it('reads a 1,000,000-row CSV only up to the plan’s site limit and says so', () => {
    // common practice: a streamed parser stops at the limit instead of reading a million rows.
    const rows = ['lat,lon'];
    for (let i = 0; i < 1_000_000; i++) rows.push(`${(i % 80) + 0.5},${(i % 170) + 0.25}`);
    const text = rows.join('\n');
    const existing = ['a', 'b', 'c'];
    const r = importSites(text, 'csv', { existingIds: existing });
    expect(r.sites).toHaveLength(MAX - existing.length);
    const m = onlyFirst.exec(r.problems.at(-1)!.message);
    expect(m).not.toBeNull();
    expect(Number(m![1].replace(/,/g, ''))).toBe(MAX - existing.length);
    expect(Number(m![2].replace(/,/g, ''))).toBe(MAX);
    expect(r.problems).toHaveLength(1);
  });

  it('reads nothing into a full plan and says the plan is full', () => {
    const existing = Array.from({ length: MAX }, (_, i) => `e${i}`);
    const r = importSites('lat,lon\n47,21\n', 'csv', { existingIds: existing });
    expect(r.sites).toEqual([]);
    expect(r.problems[0].message).toMatch(/the plan already holds [\d,]+ sites, the most it can/);
  });

  it('stops GeoJSON and KML at the limit too, MultiPoint members included', () => {
    const room = 3;
    const existing = Array.from({ length: MAX - room }, (_, i) => `e${i}`);
    const pts = Array.from({ length: 5 }, (_, i) => [21 + i / 100, 47]);
    const gj = JSON.stringify({
      type: 'FeatureCollection',
      features: [
        {
          type: 'Feature',
          properties: { id: 'm' },
          geometry: { type: 'MultiPoint', coordinates: pts },
        },
      ],
    });
    const a = importSites(gj, 'auto', { existingIds: existing });
    expect(a.sites.map((s) => s.id)).toEqual(['m-1', 'm-2', 'm-3']);
    expect(a.problems.at(-1)!.message).toMatch(onlyFirst);
    const placemarks = pts
      .map(
        (p, i) =>
          `<Placemark><name>k${i}</name><Point><coordinates>${p}</coordinates></Point></Placemark>`,
      )
      .join('');
    const b = importSites(
      `<kml xmlns="http://www.opengis.net/kml/2.2">${placemarks}</kml>`,
      'auto',
      {
        existingIds: existing,
      },
    );
    expect(b.sites.map((s) => s.id)).toEqual(['k0', 'k1', 'k2']);
    expect(b.problems.at(-1)!.message).toMatch(onlyFirst);
  });

  it('refuses a file over the import size bound without reading it', () => {
    const r = importSites('x'.repeat(MAX_IMPORT_BYTES + 1), 'csv');
    expect(r.sites).toEqual([]);
    expect(r.problems[0].message).toMatch(/larger than 20 MB/);
  });

  it('lists a bounded number of problems and counts the rest', () => {
    const bad = ['lat,lon', ...Array.from({ length: 5000 }, () => '95,21')].join('\n');
    const r = importSites(bad, 'csv');
    expect(r.sites).toEqual([]);
    expect(r.problems.length).toBeLessThanOrEqual(MAX_LISTED_PROBLEMS + 1);
    expect(r.problems.at(-1)!.message).toBe(
      `… and ${(5000 - MAX_LISTED_PROBLEMS).toLocaleString('en-US')} more problems not listed`,
    );
  });

  it('reports a row whose decimal commas split it into more fields than the header', () => {
    // "47,5" with a comma separator is two fields (RFC 4180 §2.4); reading 47 and 5 would be silent damage.
    const r = importSites('id,lat,lon\na1,47,5,21,5\na2,47.5,21.5\n', 'csv');
    expect(r.sites).toEqual([{ id: 'a2', lat: 47.5, lon: 21.5 }]);
    expect(r.problems).toEqual([
      {
        line: 2,
        message:
          'line 2: row has 5 fields, header has 3 — decimal commas? use ; as separator or . as decimal point; row not imported',
      },
    ]);
    const headerless = importSites('47,5,21,5\n', 'csv');
    expect(headerless.sites).toEqual([]);
    expect(headerless.problems[0].message).toMatch(/^line 1: row has 4 fields.*decimal commas\?/);
  });

  it('reads the same row with ; as separator and decimal commas', () => {
    // common practice: spreadsheets in decimal-comma locales write ';' separated CSV.
    const r = importSites('id;lat;lon\na1;47,5;21,5\n', 'csv');
    expect(r.problems).toEqual([]);
    expect(r.sites).toEqual([{ id: 'a1', lat: 47.5, lon: 21.5 }]);
  });

  it('reads KML written with a kml: namespace prefix', () => {
    // OGC KML 2.2 (07-147r2) §6.1: elements are in the namespace http://www.opengis.net/kml/2.2;
    // XML Namespaces 1.0 §6: a prefix bound to it names the same elements.
    const text = `<?xml version="1.0"?>
<kml:kml xmlns:kml="http://www.opengis.net/kml/2.2"><kml:Document>
  <kml:Placemark><kml:name>p1</kml:name><kml:Point><kml:coordinates>21.08,47.49</kml:coordinates></kml:Point></kml:Placemark>
  <kml:Placemark><kml:name><![CDATA[p2]]></kml:name><kml:Point><kml:coordinates>21.09,47.5,0</kml:coordinates></kml:Point></kml:Placemark>
</kml:Document></kml:kml>`;
    for (const parseXml of [
      undefined,
      (t: string) => new DOMParser().parseFromString(t, 'text/xml') as unknown as Document,
    ]) {
      const r = importSites(text, 'auto', { parseXml });
      expect(r.problems).toEqual([]);
      expect(r.sites).toEqual([
        { id: 'p1', lat: 47.49, lon: 21.08 },
        { id: 'p2', lat: 47.5, lon: 21.09 },
      ]);
    }
  });

  it('takes a UTF-8 byte-order mark in front of CSV, GeoJSON and KML', () => {
    // Unicode 15 §23.8: U+FEFF at the start is a signature, not content.
    expect(importSites('\uFEFFlat,lon\n47,21\n', 'auto').sites).toHaveLength(1);
    expect(importSites('\uFEFF{"type":"Point","coordinates":[21,47]}', 'auto').sites).toHaveLength(
      1,
    );
    expect(
      importSites(
        '\uFEFF<kml><Placemark><Point><coordinates>21,47</coordinates></Point></Placemark></kml>',
        'auto',
      ).sites,
    ).toHaveLength(1);
  });
});

describe('imported sites always fit the plan', () => {
  // Property: whatever the text, the demo plan with the imported sites added still validates.
  // Plan-level rules across fields are the user's to settle and are kept out of reach here: the
  // release is at the schema's highest altitude in calm air (release above every site, drift
  // bound), and in-range positions lie within 30 km of the demo release (sites near the release).
  // Out-of-range and unreadable values of every field are generated freely.
  const base = structuredClone(demo) as unknown as PlanFile;
  base.release.altitude_m = schemaBounds('release.altitude_m').max!;
  base.release.reference = 'AGL';
  base.groundElevation_m = Math.max(0, base.groundElevation_m ?? 0);
  base.winds = { reference: 'AGL', layers: [] };
  const { lat: lat0, lon: lon0 } = base.release;
  // Junk for a coordinate: unreadable, or outside both the latitude and longitude ranges.
  const junk = fc.oneof(
    fc.double({ min: 180.000001 }).map(String),
    fc.double({ max: -180.000001 }).map(String),
    fc.string({ maxLength: 8 }).filter((t) => !/\d/.test(t)),
    fc.constantFrom('', '180.0001', '-181', '1e308', '1e-320x', 'NaN', '47,5'),
  );
  const near = (c: number) => fc.double({ min: c - 0.2, max: c + 0.2, noNaN: true }).map(String);
  const num = fc.oneof(
    fc.double().map(String),
    fc.integer({ min: -20000, max: 20000 }).map(String),
    fc.constantFrom('1e-320', '-0', '10000', '10000.5', '-500', '-501', '0', '0.05', '1e308', ''),
  );
  const row = fc.tuple(
    fc.oneof(near(lat0), junk),
    fc.oneof(near(lon0), junk),
    num,
    num,
    fc.string({ maxLength: 300 }),
    fc.array(junk, { maxLength: 2 }),
  );
  const csv = fc
    .tuple(fc.array(row, { maxLength: 30 }), fc.constantFrom(',', ';', '\t'))
    .map(([rows, d]) =>
      [
        ['lat', 'lon', 'elevation_m', 'tolerance_m', 'name'].join(d),
        ...rows.map(([la, lo, e, t, n, more]) =>
          [la, lo, e, t, `"${n.replace(/"/g, '""')}"`, ...more].join(d),
        ),
      ].join('\n'),
    );
  // A number where the text reads as one, else the text itself (GeoJSON then has a bad position).
  const asJson = (t: string): number | string =>
    t.trim() !== '' && Number.isFinite(Number(t)) ? Number(t) : t;
  const geojson = fc.array(row, { maxLength: 20 }).map((fs) =>
    JSON.stringify({
      type: 'FeatureCollection',
      features: fs.map(([la, lo, ele, tol, name]) => ({
        type: 'Feature',
        properties: { name, elevation_m: Number(ele), tolerance_m: tol },
        geometry: { type: 'Point', coordinates: [asJson(lo), asJson(la)] },
      })),
    }),
  );
  it('for CSV and GeoJSON, with the plan nearly full', () => {
    const max = schemaMaxItems('sites');
    fc.assert(
      fc.property(
        fc.oneof(csv, geojson),
        fc.oneof(fc.integer({ min: 0, max }), fc.integer({ min: max - 5, max })),
        (text, fill) => {
          const plan = structuredClone(base);
          const extra = Array.from({ length: Math.max(0, fill - plan.sites.length) }, (_, i) => ({
            id: `fill${i}`,
            lat: lat0,
            lon: lon0,
          }));
          plan.sites = [...plan.sites, ...extra];
          // As the app calls it: with the release point, so a decimal-comma or swapped position
          // that lands far away is refused by the importer, not by the plan afterwards.
          const r = importSites(text, 'auto', {
            existingIds: plan.sites.map((s) => s.id),
            variantIds: plan.variants.map((v) => v.id),
            near: { lat: lat0, lon: lon0, maxDistance_m: FRAME_LIMIT_M },
          });
          plan.sites = [...plan.sites, ...r.sites];
          const v = validatePlan(plan);
          expect(v.ok ? [] : v.errors.slice(0, 3)).toEqual([]);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('sites far from the release', () => {
  // The plan's limit across fields: sites within FRAME_LIMIT_M of the release point.
  const near = { lat: 47.493, lon: 21.079, maxDistance_m: FRAME_LIMIT_M };

  it('are not imported when the plan could not hold them, with a swapped-order hint', () => {
    // RFC 7946 §3.1.1: a GeoJSON position is [longitude, latitude]; [47.5, 21.1] is the swap.
    const gj = JSON.stringify({
      type: 'FeatureCollection',
      features: [
        {
          type: 'Feature',
          properties: { name: 'ok' },
          geometry: { type: 'Point', coordinates: [21.08, 47.5] },
        },
        {
          type: 'Feature',
          properties: { name: 'sw' },
          geometry: { type: 'Point', coordinates: [47.5, 21.08] },
        },
      ],
    });
    const r = importSites(gj, 'auto', { near });
    expect(r.sites.map((s) => s.id)).toEqual(['ok']);
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0].message).toMatch(
      /^features\[1\]: the site is [\d.]+ km from the release point; the plan holds sites within 50\.0 km of it — latitude and longitude swapped\? \(GeoJSON and KML give longitude first\); not imported$/,
    );
    const csv = importSites('lat,lon\n47.5,21.08\n10,10\n', 'csv', { near });
    expect(csv.sites).toHaveLength(1);
    expect(csv.problems[0].message).toMatch(
      /^line 3: the site is [\d.]+ km from the release point; the plan holds sites within 50\.0 km of it; row not imported$/,
    );
  });

  it('validate in the demo plan whatever the position', () => {
    // Property: with the release given, any in-range position either fits the plan or is refused.
    fc.assert(
      fc.property(
        fc.double({ min: -90, max: 90, noNaN: true }),
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.boolean(),
        (lat, lon, close) => {
          const p = close
            ? { lat: near.lat + lat / 1000, lon: near.lon + lon / 1000 }
            : { lat, lon };
          const plan = structuredClone(demo) as unknown as PlanFile;
          const r = importSites(`lat,lon\n${p.lat},${p.lon}\n`, 'csv', {
            near,
            existingIds: plan.sites.map((s) => s.id),
          });
          plan.sites = [...plan.sites, ...r.sites];
          const v = validatePlan(plan);
          expect(v.ok ? [] : v.errors.slice(0, 3)).toEqual([]);
        },
      ),
      { numRuns: 200 },
    );
  });
});
