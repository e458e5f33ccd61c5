import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { PlanFile } from '../../app/plan/plan';
import { planDrop } from '../../app/planner/planner';
import { validatePlan } from '../../app/plan/validate';
import demo from '../../data/demo-plan.json';
import { NOW, RELEASE, geodesicDistance_m, makePlan, offsetLatLng } from './helpers';

const LAYERS = [
  { altitude_m: 10, fromDeg: 230, speed_mps: 3 },
  { altitude_m: 60, fromDeg: 250, speed_mps: 5 },
  { altitude_m: 150, fromDeg: 265, speed_mps: 7 },
];
const steered = (id: string, guidance: 'fixed-heading' | 'homing') => ({
  id,
  guidance,
  descentRate_mps: 2.9,
  glideAngle_deg: 42,
  controlTime_s: 30,
  entryLoss_m: 6,
});
const PASSIVE = { id: 'drifter', guidance: 'passive' as const, descentRate_mps: 2.9 };
const FIXED = steered('vane', 'fixed-heading');
const HOMING = steered('seeker', 'homing');

/**
 * A plan at 120 m AGL in LAYERS with the carrier flying north at 10 m/s, so each site is released
 * for at the track point whose uncontrolled landing passes closest to it: the nominal miss is the
 * site's east–west offset from the line of uncontrolled landings through `landing`.
 */
function trackPlan(
  variants: PlanFile['variants'],
  sites: PlanFile['sites'],
  extra: Partial<PlanFile> = {},
) {
  return makePlan({
    winds: { reference: 'AGL', layers: LAYERS },
    release: { ...RELEASE, altitude_m: 120, reference: 'AGL' },
    carrier: { groundSpeed_mps: 10, trackDeg: 0 },
    variants,
    sites,
    // Still air unless a test sets its own uncertainty (no modelled gusts or vertical air).
    uncertainty: { turbulence: 'none' },
    ...extra,
  });
}

// A point on the line of uncontrolled landings (the line runs north, along the track).
const landing = planDrop(trackPlan([PASSIVE], [{ id: 'x', ...RELEASE }])).sites[0].nominalLanding;
const reach = planDrop(trackPlan([HOMING], [{ id: 'x', ...RELEASE }])).sites[0].reachRadius_m;

describe('homing against fixed heading', () => {
  // Common practice: closed-loop guidance corrects errors met on the way down; an open-loop
  // programme flown in the forecast wind cannot. Same vehicle, wind error σ 1 m/s, site 35 m
  // from the uncontrolled landing (inside the ~97 m reach).
  const n = 1000;
  const r = planDrop(
    trackPlan([FIXED, HOMING], [{ id: 's', ...offsetLatLng(landing, 25, 25), tolerance_m: 8 }], {
      uncertainty: { windSpeed_mps: 1, windCorrelation_m: 300 },
      monteCarlo: { samples: n, seed: 17 },
    }),
  ).sites[0];
  const [fixed, homing] = r.byVariant;

  it('homing beats fixed-heading under wind error: smaller CEP', () => {
    expect(fixed.reachable && homing.reachable).toBe(true);
    expect(homing.cep_m).toBeLessThan(fixed.cep_m);
  });

  // The difference of two independent proportions has standard error ≤ √(2·0.25/n); demand a
  // gap of 4 such errors (0.089 at n = 1000) so the ordering is not a sampling accident.
  it('homing beats fixed-heading under wind error: higher P(hit) by more than the sampling error', () => {
    expect(homing.pHit - fixed.pHit).toBeGreaterThan(4 * Math.sqrt(0.5 / n));
  });
});

describe('homing with no uncertainty', () => {
  it('lands on any reachable site within 0.5 m', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 359.9, noNaN: true }),
        (frac, az) => {
          // East offset = nominal miss, within the reach; the north offset only moves the release.
          const d = frac * reach;
          const rad = (az * Math.PI) / 180;
          const site = offsetLatLng(landing, d * Math.sin(rad), 40 * Math.cos(rad));
          const res = planDrop(
            trackPlan([HOMING], [{ id: 's', ...site }], { monteCarlo: { samples: 4, seed: 1 } }),
          ).sites[0];
          expect(res.reachable).toBe(true);
          expect(res.cep_m).toBeLessThanOrEqual(0.5);
          expect(geodesicDistance_m(res.meanLanding, site)).toBeLessThanOrEqual(0.5);
        },
      ),
      { numRuns: 15, seed: 4242 },
    );
  });
  // Homing aims at the site from where it really is, so a descent-rate error alone (which only
  // stretches the drift and the time budget) is fully corrected while the site stays in reach.
  it('lands on a reachable site whatever its descent-rate error (σ 10 %)', () => {
    const site = offsetLatLng(landing, 25, 25);
    const r = planDrop(
      trackPlan([HOMING], [{ id: 's', ...site, tolerance_m: 0.5 }], {
        uncertainty: { descentRate_pct: 10, turbulence: 'none' },
        monteCarlo: { samples: 300, seed: 8 },
      }),
    ).sites[0];
    expect(r.pHit).toBe(1);
    expect(r.ellipse95.semiMajor_m).toBeLessThan(0.5);
  });
});

describe('recommendation', () => {
  const within = offsetLatLng(landing, -20, 30); // 36 m from the uncontrolled landing

  it('picks the first variant in catalogue order that meets requiredPHit', () => {
    const a = planDrop(trackPlan([PASSIVE, FIXED, HOMING], [{ id: 's', ...within }])).sites[0];
    expect(a.comparison.map((c) => c.pHit)).toEqual([0, 1, 1]);
    expect(a.recommended).toBe('vane');
    expect(a.variant).toBe('vane');
    expect(a.pinned).toBe(false);
    expect(a.meetsRequired).toBe(true);

    const b = planDrop(trackPlan([HOMING, FIXED, PASSIVE], [{ id: 's', ...within }])).sites[0];
    expect(b.recommended).toBe('seeker');

    // On the uncontrolled landing even the passive variant hits, and it comes first.
    const c = planDrop(trackPlan([PASSIVE, FIXED, HOMING], [{ id: 's', ...landing }])).sites[0];
    expect(c.recommended).toBe('drifter');
  });

  it('a pinned site keeps its pin even when another variant is recommended', () => {
    const r = planDrop(
      trackPlan([PASSIVE, FIXED, HOMING], [{ id: 's', ...within, variant: 'drifter' }]),
    ).sites[0];
    expect(r.recommended).toBe('vane');
    expect(r.variant).toBe('drifter');
    expect(r.pinned).toBe(true);
    expect(r.meetsRequired).toBe(false);
    expect(r.pHit).toBe(0);
  });

  it('with no variant meeting requiredPHit, the highest P(hit) is chosen', () => {
    // Release error σ 6 m against a 5 m tolerance at the uncontrolled landing: the unsteered
    // variants hit about 1 − exp(−25/72) ≈ 29 % of the time (Rayleigh); a homing variant with only
    // 2 s of thrust (about 6 m of reach) corrects part of the error. None reaches 0.99.
    const shortHoming = { ...HOMING, id: 'short-seeker', controlTime_s: 2 };
    const r = planDrop(
      trackPlan([PASSIVE, FIXED, shortHoming], [{ id: 's', ...landing, tolerance_m: 5 }], {
        uncertainty: { releasePosition_m: 6, turbulence: 'none' },
        monteCarlo: { samples: 400, seed: 2 },
        requiredPHit: 0.99,
      }),
    ).sites[0];
    const ps = r.comparison.map((c) => c.pHit);
    expect(Math.max(...ps)).toBeLessThan(0.99);
    expect(ps[2]).toBeGreaterThan(Math.max(ps[0], ps[1]));
    expect(r.recommended).toBe('short-seeker');
    expect(r.variant).toBe('short-seeker');
    expect(r.meetsRequired).toBe(false);
  });
});

describe('planDrop on the demo plan', () => {
  const checked = validatePlan(demo, { now: NOW });
  if (!checked.ok) throw new Error('demo plan must validate');
  const result = planDrop(checked.plan);

  it('gives a finite magnetic declination for the demo time and place', () => {
    expect(Number.isFinite(result.declination_deg)).toBe(true);
    expect(result.sites).toHaveLength(demo.sites.length);
  });

  it('gives every site the fields the CLI contract needs', () => {
    for (const s of result.sites) {
      expect(s.fallTime_s, s.id).toBeGreaterThan(0);
      expect(s.ellipse95.semiMajor_m, s.id).toBeGreaterThanOrEqual(s.ellipse50.semiMajor_m);
      expect(s.ellipse95.semiMinor_m, s.id).toBeGreaterThanOrEqual(s.ellipse50.semiMinor_m);
      expect(s.ellipse95.semiMajor_m).toBeGreaterThanOrEqual(s.ellipse95.semiMinor_m);
      expect(s.comparison.map((c) => c.variant)).toEqual(demo.variants.map((v) => v.id));
      expect(s.pHit).toBeGreaterThanOrEqual(0);
      expect(s.pHit).toBeLessThanOrEqual(1);
      expect(Number.isFinite(s.cep_m)).toBe(true);
      if (s.guidance === 'fixed-heading') {
        expect(Number.isFinite(s.headingTrue_deg)).toBe(true);
        expect(Number.isFinite(s.headingMag_deg)).toBe(true);
        expect(s.thrustTime_s).toBeGreaterThanOrEqual(0);
      }
    }
  });

  it('keeps every pin of the demo plan', () => {
    for (const site of demo.sites) {
      const r = result.sites.find((s) => s.id === site.id)!;
      if (site.variant) expect(r.variant).toBe(site.variant);
      expect(r.pinned).toBe(site.variant !== undefined);
    }
  });
});

describe('random streams', () => {
  // common practice: results for one site must not depend on which other sites are in the plan.
  it('removing one site leaves every other site’s numbers unchanged', () => {
    const base = structuredClone(demo) as unknown as PlanFile;
    base.monteCarlo = { samples: 200, seed: 3 };
    const fewer = structuredClone(base);
    fewer.sites = fewer.sites.slice(1);
    const v1 = validatePlan(base);
    const v2 = validatePlan(fewer);
    if (!v1.ok || !v2.ok) throw new Error('demo plan invalid');
    const a = planDrop(v1.plan).sites.slice(1);
    const b = planDrop(v2.plan).sites;
    expect(b.map((s) => [s.id, s.pHit, s.cep_m])).toEqual(a.map((s) => [s.id, s.pHit, s.cep_m]));
  });
});
