import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  decodeGroup,
  decodeWindsAloft,
  stationLayers,
  type WindsAloftLayer,
} from '../../app/formats/winds-aloft';
import demo from '../../data/demo-plan.json';
import { inSchemaRange, schemaBounds, schemaMaxItems } from '../../app/formats/import-limits';
import type { PlanFile } from '../../app/plan/plan';
import { allowedRange, validatePlan } from '../../app/plan/validate';
import { expectClose } from './helpers';

// Invented bulletin in the NWS winds-aloft ("FB") layout (docs/references.md): levels in ft MSL, each
// group right-aligned under its level. Station ids and values are made up.
const HEADER = 'FT  3000    6000    9000   12000   18000   24000  30000  34000  39000';
const QXV = 'QXV 2714 2725+00 2731-04 2638-09 2550-21 2562-33 257942 779955 760258';
const ZRL = 'ZRL      9900+05 2712+01 2818-03 3026-15 3137-27 314843 316051 315959';
const BULLETIN = [
  'WINDS ALOFT FORECAST (INVENTED EXAMPLE)',
  'VALID 121800Z   FOR USE 1400-2100Z. TEMPS NEG ABV 24000',
  '',
  HEADER,
  QXV,
  ZRL,
  'FOR USE 1400-2100Z. TEMPS NEG ABV 24000',
].join('\n');

// Exact conversions: 1 kt = 1852 m / 3600 s, 1 ft = 0.3048 m (international definitions).
const KT = 1852 / 3600;
const FT = 0.3048;

const layerAt = (layers: WindsAloftLayer[], ft: number) => layers.find((l) => l.altitude_ft === ft);

describe('winds-aloft bulletin decoding', () => {
  const d = decodeWindsAloft(BULLETIN);
  const qxv = d.stations.find((s) => s.id === 'QXV')!;
  const zrl = d.stations.find((s) => s.id === 'ZRL')!;

  it('finds the level header and every station after it, with no problems', () => {
    // NWS FB levels (docs/references.md): 3000 … 39000 ft MSL.
    expect(d.levels_ft).toEqual([3000, 6000, 9000, 12000, 18000, 24000, 30000, 34000, 39000]);
    expect(d.stations.map((s) => s.id)).toEqual(['QXV', 'ZRL']);
    expect(d.problems).toEqual([]);
  });

  it('decodes DDff±TT with direction in tens of degrees, knots and signed °C', () => {
    // NWS FB group DDff±TT (docs/references.md): 2731-04 → 270°, 31 kt, −4 °C.
    const l = layerAt(qxv.layers, 9000)!;
    expect(l.fromDeg).toBe(270);
    expect(l.speed_mps).toBe(31 * KT);
    expect(l.temperature_C).toBe(-4);
    expect(l.altitude_m).toBe(9000 * FT);
    // 2725+00 → +0 °C; ZRL 9000 ft 2712+01 → +1 °C.
    expect(layerAt(qxv.layers, 6000)!.temperature_C).toBe(0);
    expect(layerAt(zrl.layers, 9000)!.temperature_C).toBe(1);
  });

  it('has no temperature at 3000 ft', () => {
    // NWS FB (docs/references.md): no temperature is forecast for the 3000 ft level.
    const l = layerAt(qxv.layers, 3000)!;
    expect(l.temperature_C).toBeNull();
    expect(l.fromDeg).toBe(270);
    expect(l.speed_mps).toBe(14 * KT);
  });

  it('reads unsigned temperatures above 24000 ft as negative', () => {
    // NWS FB (docs/references.md): above 24000 ft the sign is omitted and temperatures are negative.
    expect(layerAt(qxv.layers, 30000)!.temperature_C).toBe(-42);
    expect(layerAt(qxv.layers, 39000)!.temperature_C).toBe(-58);
    expect(layerAt(qxv.layers, 24000)!.temperature_C).toBe(-33);
  });

  it('decodes 9900 as light and variable: speed 0, no direction', () => {
    // NWS FB (docs/references.md): 9900 = light and variable (< 5 kt).
    const l = layerAt(zrl.layers, 6000)!;
    expect(l.fromDeg).toBeNull();
    expect(l.speed_mps).toBe(0);
    expect(l.temperature_C).toBe(5);
  });

  it('decodes direction codes 51–86 as 100–199 kt: 7704 → 270° 104 kt', () => {
    // NWS FB (docs/references.md): DD + 50 and ff − 100 for 100–199 kt, e.g. 7704 → 270° 104 kt.
    const r = decodeGroup('7704', 3000);
    expect(r.ok && r.layer.fromDeg).toBe(270);
    expect(r.ok && r.layer.speed_mps).toBe(104 * KT);
    // 760258 at 39000 ft → 260°, 102 kt, −58 °C.
    const l = layerAt(qxv.layers, 39000)!;
    expect(l.fromDeg).toBe(260);
    expect(l.speed_mps).toBe(102 * KT);
  });

  it('marks 199 kt as capped: it stands for 199 kt or more', () => {
    // NWS FB (docs/references.md): winds of 200 kt or more are coded as 199 kt (7799).
    const l = layerAt(qxv.layers, 34000)!;
    expect(l.fromDeg).toBe(270);
    expect(l.speed_mps).toBe(199 * KT);
    expect(l.capped).toBe(true);
    expect(layerAt(qxv.layers, 39000)!.capped).toBeUndefined();
    const s = stationLayers(d, 'QXV');
    expect(s.problems.some((p) => /199 kt or more/.test(p))).toBe(true);
  });

  it('leaves out a group that is blank near station elevation, aligning the rest by column', () => {
    // NWS FB (docs/references.md): no wind group within 1500 ft of station elevation.
    expect(zrl.layers.map((l) => l.altitude_ft)).toEqual([
      6000, 9000, 12000, 18000, 24000, 30000, 34000, 39000,
    ]);
    expect(zrl.problems).toEqual([]);
  });

  it('places groups by column when a middle group is blank', () => {
    // common practice: groups sit under their level label, so a gap keeps the others in place.
    const line = 'QXW 2714         2731-04 2638-09 2550-21 2562-33 257942 259252 760258';
    const r = decodeWindsAloft(`${HEADER}\n${line}`);
    expect(r.stations[0].layers.map((l) => l.altitude_ft)).toEqual([
      3000, 9000, 12000, 18000, 24000, 30000, 34000, 39000,
    ]);
    expect(r.problems).toEqual([]);
  });

  it('takes missing groups as the lowest levels when spacing is lost, and says so', () => {
    // common practice: missing groups are those near station elevation, i.e. the lowest levels.
    const line = 'ZRL 9900+05 2712+01 2818-03 3026-15 3137-27 314843 316051 315959';
    const r = decodeWindsAloft(`${HEADER}\n${line}`);
    expect(r.stations[0].layers[0].altitude_ft).toBe(6000);
    expect(r.stations[0].layers.length).toBe(8);
    expect(r.problems[0]).toMatch(/^line 2: ZRL: groups are not aligned/);
  });

  it('reports malformed groups with line and reason and keeps the good ones', () => {
    // common practice: a bad group spoils one level, not the station.
    const line = 'QXZ 2714 27X5+00 4531-04 2638-09 2550X21  256233 257942 259252 760258';
    const r = decodeWindsAloft(`${HEADER}\n${line}`);
    const s = r.stations[0];
    expect(
      s.problems.some((p) => /^line 2: QXZ 6000 ft group "27X5\+00": expected DDff/.test(p)),
    ).toBe(true);
    expect(s.problems.some((p) => /9000 ft group "4531-04": direction code 45/.test(p))).toBe(true);
    expect(s.problems.some((p) => /18000 ft group "2550X21"/.test(p))).toBe(true);
    expect(s.problems.some((p) => /"256233": temperature without a sign/.test(p))).toBe(true);
    expect(s.layers.length).toBe(5);
    expect(layerAt(s.layers, 3000)?.speed_mps).toBe(14 * KT);
    expect(layerAt(s.layers, 12000)?.fromDeg).toBe(260);
    expect(layerAt(s.layers, 39000)?.fromDeg).toBe(260);
    expect(r.problems).toEqual(expect.arrayContaining(s.problems));
  });

  it('reports group-like lines without a station id', () => {
    const r = decodeWindsAloft(`${HEADER}\n2714 2725+00 2731-04`);
    expect(r.problems).toEqual([
      'line 2: not a station line (expected a 3–4 character station id, then groups)',
    ]);
  });

  it('reports a text without a level header', () => {
    const r = decodeWindsAloft('QXV 2714 2725+00');
    expect(r.stations).toEqual([]);
    expect(r.problems[0]).toMatch(/no level header/);
  });

  it('reports a repeated station and keeps the first', () => {
    const r = decodeWindsAloft(`${HEADER}\n${QXV}\n${QXV.replace('2714', '0910')}`);
    expect(r.stations.length).toBe(1);
    expect(r.stations[0].layers[0].fromDeg).toBe(270);
    expect(r.problems[0]).toMatch(/^line 3: station QXV appears again \(first on line 2\)/);
  });

  it('never throws on arbitrary text, with or without a header', () => {
    // common practice: parsers of user files are fuzzed.
    fc.assert(
      fc.property(fc.string({ maxLength: 300 }), fc.boolean(), (s, withHeader) => {
        const r = decodeWindsAloft(withHeader ? `${HEADER}\n${s}` : s);
        expect(Array.isArray(r.problems)).toBe(true);
        for (const st of r.stations)
          for (const l of st.layers) expect(Number.isFinite(l.speed_mps)).toBe(true);
      }),
    );
    const group = fc.stringMatching(/^[0-9]{4}([+-]?[0-9]{2})?$/);
    fc.assert(
      fc.property(
        fc.array(fc.oneof(group, fc.constant(' '), fc.string({ maxLength: 4 })), { maxLength: 12 }),
        (gs) => {
          const r = decodeWindsAloft(`${HEADER}\nQXV ${gs.join(' ')}`);
          const lv = stationLayers(r, 'QXV', { reference: 'AGL', groundElevation_m: 300 });
          for (const l of lv.layers) {
            expect(l.altitude_m).toBeGreaterThan(0);
            expect(l.speed_mps).toBeGreaterThanOrEqual(0);
          }
        },
      ),
    );
  });
});

describe('station layers for a plan', () => {
  const d = decodeWindsAloft(`${HEADER}\n${QXV}\n${ZRL}`);

  it('gives MSL layers in m/s and temperatures in K', () => {
    const s = stationLayers(d, 'qxv');
    expect(s.reference).toBe('MSL');
    expect(s.layers[0]).toEqual({ altitude_m: 3000 * FT, fromDeg: 270, speed_mps: 14 * KT });
    expect(s.temperatures[0].altitude_m).toBe(6000 * FT);
    // SI: T(K) = T(°C) + 273.15.
    expectClose(s.temperatures[1].temperature_K, 273.15 - 4, 1e-12);
  });

  it('gives AGL layers above the plan ground and leaves out levels below it', () => {
    const s = stationLayers(d, 'QXV', { reference: 'AGL', groundElevation_m: 1000 });
    // 3000 ft = 914.4 m lies below 1000 m ground.
    expect(s.layers[0].altitude_m).toBeCloseTo(6000 * FT - 1000, 9);
    // 8 levels above it; 34000 ft is coded 199 kt, over the plan's speed limit (see below).
    expect(s.layers.length).toBe(8 - (inSchemaRange('winds.layers[].speed_mps', 199 * KT) ? 0 : 1));
    expect(s.problems.some((p) => /1 level\(s\) at or below the ground/.test(p))).toBe(true);
  });

  it('carries the nearest level direction into light and variable, at speed 0', () => {
    const s = stationLayers(d, 'ZRL');
    // ZRL 6000 ft is 9900; its nearest level with a direction is 9000 ft (270°).
    expect(s.layers[0]).toEqual({ altitude_m: 6000 * FT, fromDeg: 270, speed_mps: 0 });
  });

  it('reports an unknown station and gives no layers', () => {
    const s = stationLayers(d, 'ABC');
    expect(s.layers).toEqual([]);
    expect(s.problems).toEqual(['station ABC is not in the bulletin']);
  });
});

describe('station layers stay inside the plan schema', () => {
  const speedMax = schemaBounds('winds.layers[].speed_mps').max!;
  const tMax = schemaBounds('atmosphere.sounding.levels[].temperature_K').max!;

  it('does not hand on a 199 kt group over the plan’s speed limit, and says why by line', () => {
    // NWS FB: 7799 = 270° at 199 kt, which stands for 199 kt or more; 199 × 1852/3600 = 102.3744 m/s.
    expect(199 * KT).toBeGreaterThan(speedMax); // the case this test is about
    const d = decodeWindsAloft(`FT  3000    6000\nQXV 2714 7799+05`);
    const s = stationLayers(d, 'QXV');
    expect(s.layers).toEqual([{ altitude_m: 3000 * FT, fromDeg: 270, speed_mps: 14 * KT }]);
    expect(s.problems).toEqual([
      `line 2: QXV 6000 ft: speed_mps 102.3744 is outside the plan's range (${allowedRange('winds.layers[0].speed_mps')}); 199 kt is coded for 199 kt or more; wind not used`,
    ]);
    // The temperature of that group is in range and is kept.
    expect(s.temperatures).toEqual([{ altitude_m: 6000 * FT, temperature_K: 273.15 + 5 }]);
    expect(s.notUsed).toBe(1);
  });

  it('does not hand on +99 °C (372.15 K), above the plan’s temperature limit', () => {
    // SI: 99 °C = 372.15 K.
    expect(99 + 273.15).toBeGreaterThan(tMax);
    const s = stationLayers(decodeWindsAloft(`FT  3000    6000\nQXV 2714 2725+99`), 'QXV');
    expect(s.layers).toHaveLength(2);
    expect(s.temperatures).toEqual([]);
    expect(s.problems[0]).toMatch(
      /^line 2: QXV 6000 ft: temperature_K 372\.15 is outside the plan's range .* \(99 °C\); temperature not used$/,
    );
  });

  it('keeps only the first levels up to the plan’s layer limit and says so', () => {
    const max = schemaMaxItems('winds.layers');
    const n = max + 50;
    const levels = Array.from({ length: n }, (_, i) => 1000 + i * 100); // ft, below 20000 m
    const header = `FT${levels.map((ft) => String(ft).padStart(7)).join('')}`;
    const station = `QXV${levels.map(() => '2710'.padStart(7)).join('')}`;
    const s = stationLayers(decodeWindsAloft(`${header}\n${station}`), 'QXV');
    expect(s.layers).toHaveLength(max);
    expect(s.layers.at(-1)!.altitude_m).toBeCloseTo(levels[max - 1] * FT, 9);
    expect(s.problems).toEqual([
      `line 2: QXV: only the first ${max.toLocaleString('en-US')} wind layers were read (the plan holds at most ${max.toLocaleString('en-US')}); 50 higher level(s) not used`,
    ]);
    expect(s.notUsed).toBe(50);
  });

  it('never gives the demo plan a layer or temperature it rejects, on any bulletin', () => {
    // Property: whatever the groups say, the layers and temperatures validate in a plan.
    const group = fc.oneof(
      fc
        .tuple(
          fc.integer({ min: 0, max: 99 }),
          fc.integer({ min: 0, max: 99 }),
          fc.constantFrom('+', '-', ''),
          fc.integer({ min: 0, max: 99 }),
        )
        .map(
          ([dd, ff, sg, tt]) =>
            `${String(dd).padStart(2, '0')}${String(ff).padStart(2, '0')}${sg}${String(tt).padStart(2, '0')}`,
        ),
      fc.constantFrom('9900', '7799', '7799+99', '2725-99'),
    );
    const levels = fc
      .uniqueArray(fc.integer({ min: 100, max: 99999 }), { minLength: 1, maxLength: 12 })
      .map((a) => a.sort((x, y) => x - y));
    fc.assert(
      fc.property(
        levels,
        fc.array(group, { maxLength: 12 }),
        fc.integer({ min: -400, max: 4000 }),
        (lv, gs, ground) => {
          const text = `FT${lv.map((ft) => String(ft).padStart(8)).join('')}\nQXV${gs
            .slice(0, lv.length)
            .map((g) => g.padStart(8))
            .join('')}`;
          const r = stationLayers(decodeWindsAloft(text), 'QXV', {
            groundElevation_m: ground,
            reference: 'MSL',
          });
          const plan = structuredClone(demo) as unknown as PlanFile;
          plan.groundElevation_m = ground;
          plan.winds = { ...plan.winds, reference: 'MSL', layers: r.layers };
          if (r.temperatures.length)
            plan.atmosphere = { sounding: { reference: 'MSL', levels: r.temperatures } };
          plan.sites = plan.sites.map((s) => ({ ...s, elevation_m: ground }));
          const v = validatePlan(plan);
          expect(v.ok ? [] : v.errors.slice(0, 3)).toEqual([]);
        },
      ),
      { numRuns: 300 },
    );
  });
});
