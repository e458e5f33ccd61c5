import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { importSounding } from '../../app/formats/sounding-csv';
import { expectClose } from './helpers';

// Exact unit definitions: 1 ft = 0.3048 m, 1 kt = 1852/3600 m/s, 1 mi = 1609.344 m (international
// yard and pound, 1959); 1 km/h = 1000/3600 m/s; T(K) = T(°C) + 273.15 (SI).
const FT = 0.3048;
const KT = 1852 / 3600;

import demo from '../../data/demo-plan.json';
import { inSchemaRange, schemaMaxItems } from '../../app/formats/import-limits';
import type { PlanFile } from '../../app/plan/plan';
import { allowedRange, validatePlan } from '../../app/plan/validate';

describe('sounding import: units and reference from the header', () => {
  it('converts feet and knots exactly and reads AGL from the header', () => {
    const r = importSounding(
      'altitude_ft_agl,direction_deg,speed_kt,temperature_C\n' +
        '1000,270,20,15\n' +
        '500,250,12,16.5\n',
    );
    expect(r.problems).toEqual([]);
    expect(r.reference).toBe('AGL');
    // Sorted ascending.
    expect(r.layers).toEqual([
      { altitude_m: 500 * FT, fromDeg: 250, speed_mps: 12 * KT },
      { altitude_m: 1000 * FT, fromDeg: 270, speed_mps: 20 * KT },
    ]);
    expectClose(r.temperatures[0].temperature_K, 289.65, 1e-12);
    expect(r.pressures).toBeUndefined();
  });

  it('reads semicolons with decimal commas, a BOM, CRLF, km/h, MSL and Kelvin', () => {
    const r = importSounding(
      '\uFEFFHeight (m MSL);Dir;Speed (km/h);T (K)\r\n120;180;36;288,5\r\n300;190;54,0;287\r\n',
    );
    expect(r.problems).toEqual([]);
    expect(r.reference).toBe('MSL');
    expect(r.layers[0]).toEqual({ altitude_m: 120, fromDeg: 180, speed_mps: 10 });
    expectClose(r.layers[1].speed_mps, 15, 1e-12);
    expect(r.temperatures[0]).toEqual({ altitude_m: 120, temperature_K: 288.5 });
  });

  it('reads tabs, km, mph, °F and pressure in hPa and inHg', () => {
    const r = importSounding(
      'alt km\tdirection\tspeed mph\ttemp °F\tp inHg\n0.5\t90\t10\t50\t29.92\n',
    );
    expect(r.problems).toEqual([]);
    expect(r.reference).toBeNull();
    expect(r.layers[0].altitude_m).toBe(500);
    expectClose(r.layers[0].speed_mps, (10 * 1609.344) / 3600, 1e-12);
    // 50 °F = 10 °C = 283.15 K.
    expectClose(r.temperatures[0].temperature_K, 283.15, 1e-9);
    // 1 inHg = 3386.389 Pa (NIST SP 811, B.8).
    expectClose(r.pressures![0].pressure_Pa, 29.92 * 3386.389, 1e-6);
    const h = importSounding('hAGL [m],wdir,wspd [m/s],pres [hPa]\n10,45,3.5,1013.25\n');
    expect(h.reference).toBe('AGL');
    expect(h.pressures).toEqual([{ altitude_m: 10, pressure_Pa: 101325 }]);
  });

  it('assumes and reports units that the header does not give', () => {
    const r = importSounding('height,dir,speed,temp\n100,200,5,280\n');
    expect(r.layers).toEqual([{ altitude_m: 100, fromDeg: 200, speed_mps: 5 }]);
    // Unitless temperature above 100 reads as Kelvin.
    expect(r.temperatures[0].temperature_K).toBe(280);
    expect(r.problems.map((p) => p.line)).toEqual([1, 1, 1]);
    expect(r.problems.map((p) => p.message).join('\n')).toMatch(/"height": no unit.*assumed m/);
  });
});

describe('sounding import: bad input', () => {
  it('reports bad rows by line with the reason and keeps the good rows', () => {
    const text = [
      '# invented sounding',
      'altitude_m,direction_deg,speed_mps,temperature_C',
      '10,200,3,12',
      '',
      'abc,200,3,12',
      '50,400,4,11',
      '100,210,-1,10',
      '150,215,5,hot',
      '200,220,6,9',
      '120,212,4.5,10.5',
      '200,225,7,8',
      '250,,6,7',
    ].join('\n');
    const r = importSounding(text);
    const byLine = Object.fromEntries(r.problems.map((p) => [p.line, p.message]));
    expect(byLine[5]).toMatch(/altitude "abc" is not a number; row skipped/);
    // Meteorological direction 0…360° (WMO No. 306 code 0877); the range text is the schema's.
    expect(byLine[6]).toBe(
      `fromDeg 400 is outside the plan's range (${allowedRange('winds.layers[0].fromDeg')}) (400 deg in the file); wind left out`,
    );
    expect(byLine[7]).toMatch(
      /^speed_mps -1 is outside the plan's range .*\(-1 m\/s in the file\); wind left out$/,
    );
    expect(byLine[8]).toMatch(/temperature "hot" is not a number; temperature left out/);
    expect(byLine[11]).toMatch(/altitude 200 m repeats line 9; kept the first/);
    expect(byLine[12]).toMatch(/direction is empty; wind left out/);
    expect(Object.keys(byLine).map(Number)).toEqual([5, 6, 7, 8, 11, 12]);
    expect(r.layers.map((l) => l.altitude_m)).toEqual([10, 120, 150, 200]);
    expect(r.layers[3].fromDeg).toBe(220);
    expect(r.temperatures.map((t) => t.altitude_m)).toEqual([10, 50, 100, 120, 200, 250]);
  });

  it('reports a file without an altitude header', () => {
    const r = importSounding('1,2,3\n4,5,6\n');
    expect(r.layers).toEqual([]);
    expect(r.problems[0]).toMatchObject({ line: 1 });
    expect(r.problems[0].message).toMatch(/no header row naming an altitude column/);
  });

  it('never throws on arbitrary text, with or without a header', () => {
    // common practice: parsers of user files are fuzzed.
    const cell = fc.oneof(fc.string({ maxLength: 6 }), fc.double().map(String), fc.constant(''));
    fc.assert(
      fc.property(
        fc.string({ maxLength: 200 }),
        fc.array(fc.array(cell, { maxLength: 6 }), { maxLength: 8 }),
        fc.constantFrom(',', ';', '\t'),
        (s, rows, sep) => {
          for (const text of [
            s,
            `alt_ft_agl${sep}dir${sep}kt${sep}temp C\n${rows.map((r) => r.join(sep)).join('\n')}`,
          ]) {
            const r = importSounding(text);
            for (const l of r.layers) {
              expect(Number.isFinite(l.altitude_m) && Number.isFinite(l.speed_mps)).toBe(true);
            }
            for (const p of r.problems) expect(p.line).toBeGreaterThanOrEqual(1);
            const zs = r.layers.map((l) => l.altitude_m);
            expect(zs).toEqual([...zs].sort((a, b) => a - b));
          }
        },
      ),
    );
  });
});

describe('sounding import stays inside the plan schema', () => {
  it('reads 1,000 rows only up to the plan’s layer and level limits, and says so', () => {
    const maxLayers = schemaMaxItems('winds.layers');
    const maxLevels = schemaMaxItems('atmosphere.sounding.levels');
    const rows = ['altitude_m,direction_deg,speed_mps,temperature_C'];
    for (let i = 0; i < 1000; i++) rows.push(`${i * 10},${i % 360},5,${15 - i * 0.0065}`);
    const r = importSounding(rows.join('\n'));
    expect(r.layers).toHaveLength(Math.min(1000, maxLayers));
    expect(r.temperatures).toHaveLength(Math.min(1000, maxLevels));
    // The first rows of the file are the ones kept.
    expect(r.layers.at(-1)!.altitude_m).toBe((maxLayers - 1) * 10);
    const msgs = r.problems.map((p) => p.message);
    const g = (n: number) => n.toLocaleString('en-US');
    expect(msgs).toContain(
      `only the first ${g(maxLayers)} wind layers were read (the plan holds at most ${g(maxLayers)}); ` +
        `the wind of ${g(Math.min(1000, maxLevels) - maxLayers)} later row(s) was left out; rows from line ${maxLevels + 2} on were not read`,
    );
    expect(
      msgs.some((m) => m.startsWith(`only the first ${g(maxLevels)} temperatures were read`)),
    ).toBe(true);
    expect(r.notUsed).toBe(Math.min(1000, maxLevels) - maxLayers);
  });

  it('leaves out +99 °C (372.15 K) and a 200 kt wind, keeping the rest of each row', () => {
    // SI: 99 °C = 372.15 K; 200 kt × 1852/3600 = 102.9 m/s. Both over today's plan limits:
    expect(inSchemaRange('atmosphere.sounding.levels[].temperature_K', 372.15)).toBe(false);
    expect(inSchemaRange('winds.layers[].speed_mps', (200 * 1852) / 3600)).toBe(false);
    const r = importSounding('alt_ft,dir,speed_kt,temp_C\n1000,270,20,99\n2000,280,200,10\n');
    expect(r.layers.map((l) => l.altitude_m)).toEqual([304.8]);
    expect(r.temperatures.map((t) => t.altitude_m)).toEqual([609.6]);
    expect(r.problems.map((p) => [p.line, p.message])).toEqual([
      [
        2,
        `temperature_K 372.15 is outside the plan's range (${allowedRange('atmosphere.sounding.levels[0].temperature_K')}) (99 °C in the file); temperature left out`,
      ],
      [
        3,
        `speed_mps 102.8889 is outside the plan's range (${allowedRange('winds.layers[0].speed_mps')}) (200 kt in the file); wind left out`,
      ],
    ]);
    expect(r.notUsed).toBe(2);
  });

  it('never gives the demo plan a layer or level it rejects, on any numbers', () => {
    // Property: whatever the rows hold, the layers and temperatures validate in a plan.
    const num = fc.oneof(
      fc.double({ noNaN: true, min: -1e6, max: 1e6 }),
      fc.integer({ min: -1000, max: 40000 }),
      fc.constantFrom('', 'x', '1e400', '-0'),
    );
    const header = fc.constantFrom(
      'altitude_m,direction_deg,speed_mps,temperature_C',
      'alt_ft_agl,dir,speed_kt,temp_K',
      'height_km,wdir,ws_kmh,t_F',
    );
    fc.assert(
      fc.property(header, fc.array(fc.tuple(num, num, num, num), { maxLength: 40 }), (h, rows) => {
        const r = importSounding([h, ...rows.map((x) => x.join(','))].join('\n'));
        const plan = structuredClone(demo) as unknown as PlanFile;
        const ref = r.reference ?? 'MSL';
        plan.winds = { ...plan.winds, reference: ref, layers: r.layers };
        if (r.temperatures.length)
          plan.atmosphere = { sounding: { reference: ref, levels: r.temperatures } };
        const v = validatePlan(plan);
        expect(v.ok ? [] : v.errors.slice(0, 3)).toEqual([]);
      }),
      { numRuns: 300 },
    );
  });
});

describe('sounding rows with more fields than the header', () => {
  it('are skipped with a decimal-comma hint, not read as other numbers', () => {
    // "27,5" with a comma separator is two fields (RFC 4180 §2.4).
    const r = importSounding('altitude_m,direction_deg,speed_mps\n100,270,5\n200,280,7,5\n');
    expect(r.layers).toEqual([{ altitude_m: 100, fromDeg: 270, speed_mps: 5 }]);
    expect(r.problems).toEqual([
      {
        line: 3,
        message:
          'row has 4 fields, header has 3 — decimal commas? use ; as separator or . as decimal point; row skipped',
      },
    ]);
    // The same numbers with ';' and decimal commas read.
    const ok = importSounding('altitude_m;direction_deg;speed_mps\n200;280;7,5\n');
    expect(ok.problems).toEqual([]);
    expect(ok.layers).toEqual([{ altitude_m: 200, fromDeg: 280, speed_mps: 7.5 }]);
  });
});
