// The automatic checks name the sites (and variants) their findings are about, and the wind
// profile's coverage of the fall is checked with the planner's own rule.
import { polygon } from '@turf/turf';
import { describe, expect, it } from 'vitest';
import { decodeWindsAloft, stationLayers } from '../../app/formats/winds-aloft';
import type { PlanFile, Variant } from '../../app/plan/plan';
import { validatePlan } from '../../app/plan/validate';
import { planDrop } from '../../app/planner/planner';
import { shortList } from '../../app/safety/check-result';
import {
  DEFAULT_SAFETY_SETTINGS,
  safetyChecks,
  type CheckResult,
  type SafetySettings,
} from '../../app/safety/safety';
import demo from '../../data/demo-plan.json';
import { NOW, RELEASE, offsetLatLng } from './helpers';

const PASSIVE: Variant = { id: 'drifter', guidance: 'passive', descentRate_mps: 3 };

/** Six sites 300 m apart on an east–west line north of the release; s2 and s5 are the odd ones. */
const SIX = [1, 2, 3, 4, 5, 6].map((k) => ({
  id: `s${k}`,
  name: k === 5 ? 'Oxbow Spit' : `s${k}`,
  ...offsetLatLng(RELEASE, (k - 3.5) * 300, 60),
}));
const odd = (id: string) => id === 's2' || id === 's5';

function run(over: Partial<PlanFile>, settings: Partial<SafetySettings> = {}) {
  const file: PlanFile = {
    format: 'seedfall-plan',
    version: 1,
    name: 'naming test',
    time: NOW.toISOString(),
    groundElevation_m: 0,
    release: { lat: RELEASE.lat, lon: RELEASE.lon, altitude_m: 100, reference: 'AGL' },
    carrier: { groundSpeed_mps: 0, trackDeg: 0 },
    winds: { reference: 'AGL', layers: [{ altitude_m: 10, fromDeg: 270, speed_mps: 2 }] },
    variants: [PASSIVE],
    sites: SIX,
    monteCarlo: { samples: 200, seed: 3 },
    ...over,
  };
  const v = validatePlan(file, { now: NOW });
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  const result = planDrop(v.plan, { probeSamples: 64 });
  const report = safetyChecks(v.plan, result, { ...DEFAULT_SAFETY_SETTINGS, ...settings });
  const check = (id: string): CheckResult => {
    const c = report.checks.find((x) => x.id === id);
    if (!c) throw new Error(`no check ${id}`);
    return c;
  };
  return { plan: v.plan, result, check };
}

/** The why names s2 and s5 (s5 with its name) and no other of the six sites. */
function namesOnlyS2S5(c: CheckResult): void {
  expect(c.sites).toEqual(['s2', 's5']);
  expect(c.why).toContain('s2');
  expect(c.why).toContain('s5 “Oxbow Spit”');
  for (const other of ['s1', 's3', 's4', 's6'])
    expect(c.why).not.toMatch(new RegExp(`\\b${other}\\b`));
}

describe('checks that name sites', () => {
  it('lists at most three and counts the rest, never "1 more"', () => {
    // common practice (plain English list)
    expect(shortList([])).toBe('');
    expect(shortList(['s03'])).toBe('s03');
    expect(shortList(['s03', 's07'])).toBe('s03 and s07');
    expect(shortList(['s03', 's07', 's11', 's12'])).toBe('s03, s07, s11 and s12');
    const many = Array.from({ length: 17 }, (_, i) => `s${String(i * 4 + 3).padStart(2, '0')}`);
    expect(shortList(many)).toBe('s03, s07, s11 and 14 more');
  });

  it('battery: names the sites that need more than 80 % of the control time, with their thrust', () => {
    // s2 and s5 fly a variant with 12 s of control time, the rest one with 30 s; the moving
    // carrier puts every site 60 m off the track, so each needs thrust.
    const steer = (id: string, controlTime_s: number): Variant => ({
      id,
      guidance: 'fixed-heading',
      descentRate_mps: 3,
      glideAngle_deg: 45,
      controlTime_s,
    });
    const { result, check } = run({
      carrier: { groundSpeed_mps: 8, trackDeg: 90 },
      variants: [steer('long', 30), steer('short', 12)],
      sites: SIX.map((s) => ({ ...s, variant: odd(s.id) ? 'short' : 'long' })),
    });
    const c = check('battery');
    expect(c.status).toBe('fail');
    namesOnlyS2S5(c);
    // The thrust time of each named site is the planner's own, rounded to 0.1 s; the limit is
    // 12 s × (1 − 20 %) = 9.6 s (hand calculation).
    for (const id of ['s2', 's5']) {
      const t = Math.round(result.sites.find((s) => s.id === id)!.thrustTime_s! * 10) / 10;
      expect(t).toBeGreaterThan(9.6);
      expect(c.why).toContain(`${t} s of thrust, 9.6 s allowed`);
    }
    expect(c.why).toMatch(/^2 sites need more than 80 % of the control time: /);
  });

  it('p-hit: names the sites below the required P(hit), each with P(hit) ± its standard error', () => {
    // s2 and s5 must land within 0.1 m (P(hit) near 0); the others within 500 m (P(hit) 1).
    const { result, check } = run({
      sites: SIX.map((s) => ({ ...s, tolerance_m: odd(s.id) ? 0.1 : 500 })),
      uncertainty: { windSpeed_mps: 1 },
    });
    const c = check('p-hit');
    expect(c.status).toBe('fail');
    namesOnlyS2S5(c);
    for (const id of ['s2', 's5']) {
      const s = result.sites.find((x) => x.id === id)!;
      // pHitText form "0.00 ± <0.01" (two decimals, as the results table shows it).
      expect(c.why).toMatch(
        new RegExp(`${id}[^(]*\\(\\d\\.\\d\\d ± (<0\\.01|\\d\\.\\d\\d) with drifter\\)`),
      );
      expect(c.items).toContainEqual(
        expect.objectContaining({ site: id, pHit: Math.round(s.pHit * 1000) / 1000 }),
      );
    }
  });

  it('no-drop zones: names the sites whose ellipses come too close, with the zone and clearance', () => {
    // A 60 m square zone on s2 and another on s5: their ellipses overlap them (clearance 0).
    const square = (at: { lat: number; lon: number }, name: string) => {
      const c = (e: number, n: number) => {
        const p = offsetLatLng(at, e, n);
        return [p.lon, p.lat];
      };
      const ring = [c(-30, -30), c(30, -30), c(30, 30), c(-30, 30)];
      return polygon([[...ring, ring[0]]], { name });
    };
    const { check } = run(
      {},
      {
        noDropZones: [square(SIX[1], 'pump house'), square(SIX[4], 'hide')],
      },
    );
    const c = check('no-drop-zones');
    expect(c.status).toBe('fail');
    namesOnlyS2S5(c);
    expect(c.why).toContain('s2 (0 m from pump house)');
    expect(c.why).toContain('s5 “Oxbow Spit” (0 m from hide)');
  });

  it('wind limits: names the variant over its limit and the sites that use it', () => {
    const { check } = run({
      winds: { reference: 'AGL', layers: [{ altitude_m: 50, fromDeg: 270, speed_mps: 5 }] },
      variants: [
        { ...PASSIVE, maxWind_mps: 20 },
        { ...PASSIVE, id: 'light', maxWind_mps: 4 },
      ],
      sites: SIX.map((s) => ({ ...s, variant: odd(s.id) ? 'light' : 'drifter' })),
    });
    const c = check('wind-limit');
    expect(c.status).toBe('fail');
    namesOnlyS2S5(c);
    expect(c.why).toContain('light (limit 4 m/s), used at s2 and s5 “Oxbow Spit”');
    expect(c.why).not.toContain('drifter');
  });

  it('a wind limit not set names the variant and its sites as a warning', () => {
    const c = run({}).check('wind-limit');
    expect(c.status).toBe('warn');
    expect(c.sites).toEqual(SIX.map((s) => s.id));
    expect(c.why).toMatch(/^No wind limit set for drifter, used at s1, s2, s3 and 3 more;/);
  });

  it('passing checks name no site', () => {
    const { check } = run({
      variants: [{ ...PASSIVE, maxWind_mps: 20 }],
      sites: SIX.map((s) => ({ ...s, tolerance_m: 500 })),
    });
    for (const id of ['p-hit', 'wind-limit', 'no-drop-zones']) {
      expect(check(id).sites ?? []).toEqual([]);
    }
  });
});

describe('wind-coverage', () => {
  // An invented bulletin in the NWS winds-aloft ("FB") layout (docs/references.md): the lowest
  // level is 3000 ft MSL = 914.4 m (1 ft = 0.3048 m exactly). Over ground at 199.4 m MSL that is
  // 715 m above the plan ground; a release 110 m above the ground is 605 m below it.
  const BULLETIN = ['FT  3000    6000    9000', 'QXV 2714 2725+00 2731-04'].join('\n');
  const ground = 199.4;

  it('warns that the whole fall is extrapolated when the lowest layer is 605 m above the release', () => {
    const st = stationLayers(decodeWindsAloft(BULLETIN), 'QXV', {
      groundElevation_m: ground,
      reference: 'AGL',
    });
    expect(st.layers[0].altitude_m).toBeCloseTo(715, 6);
    const { result, check } = run({
      groundElevation_m: ground,
      release: { lat: RELEASE.lat, lon: RELEASE.lon, altitude_m: 110, reference: 'AGL' },
      winds: { reference: 'AGL', layers: st.layers },
      sites: SIX.map((s) => ({ ...s, elevation_m: ground })),
    });
    const c = check('wind-coverage');
    expect(c.status).toBe('warn');
    expect(c.title).toBe('Wind profile covers the fall');
    expect(c.why).toContain('605 m above the release');
    expect(c.why).toContain('715 m above the plan ground');
    // The same words as the planner's warning: one rule, not two.
    const w = result.warnings.find((x) => x.includes('lowest wind layer'))!;
    expect(c.why.toLowerCase()).toContain(w.replace(/^winds: /, '').toLowerCase());
  });

  it('warns by how much the top layer is below the release', () => {
    // Layers up to 50 m above the ground, release at 110 m: the top 60 m hold the 50 m wind.
    const c = run({
      release: { lat: RELEASE.lat, lon: RELEASE.lon, altitude_m: 110, reference: 'AGL' },
      winds: {
        reference: 'AGL',
        layers: [
          { altitude_m: 10, fromDeg: 270, speed_mps: 2 },
          { altitude_m: 50, fromDeg: 270, speed_mps: 4 },
        ],
      },
    }).check('wind-coverage');
    expect(c.status).toBe('warn');
    expect(c.why).toContain('60 m below the release');
  });

  it('passes on the demo plan, whose layers span the fall', () => {
    const d = structuredClone(demo) as unknown as PlanFile;
    d.monteCarlo = { samples: 50, seed: 1 };
    const v = validatePlan(d);
    if (!v.ok) throw new Error('demo plan invalid');
    const result = planDrop(v.plan, { probeSamples: 32 });
    const c = safetyChecks(v.plan, result).checks.find((x) => x.id === 'wind-coverage')!;
    expect(c.status).toBe('pass');
    expect(result.warnings.filter((w) => w.startsWith('winds:'))).toEqual([]);
  });
});
