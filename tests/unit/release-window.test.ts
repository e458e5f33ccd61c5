import { Geodesic } from 'geographiclib-geodesic';
import { describe, expect, it } from 'vitest';
import { FallTable } from '../../app/model/fall-table';
import { passiveOffset, type FlightSetup } from '../../app/model/flight';
import type { PlanFile } from '../../app/plan/plan';
import { planDrop } from '../../app/planner/planner';
import {
  bestShift,
  hitProfile,
  profileAt,
  runAround,
  type HitProfile,
} from '../../app/model/release-window';
import { WindProfile } from '../../app/model/wind';
import { RELEASE, expectClose, expectNearLatLng, makePlan, offsetLatLng } from './helpers';

const DEG = Math.PI / 180;

/** Local east/north (m) of p about RELEASE by GeographicLib: azimuthal equidistant coordinates. */
function localOf(p: { lat: number; lon: number }): { x: number; y: number } {
  const r = Geodesic.WGS84.Inverse(RELEASE.lat, RELEASE.lon, p.lat, p.lon);
  const s = r.s12 as number;
  const az = (r.azi1 as number) * DEG;
  return { x: s * Math.sin(az), y: s * Math.cos(az) };
}

const LAYERS = [
  { altitude_m: 10, fromDeg: 300, speed_mps: 3 },
  { altitude_m: 80, fromDeg: 315, speed_mps: 6 },
  { altitude_m: 150, fromDeg: 320, speed_mps: 8 },
];
const PASSIVE = { id: 'drifter', guidance: 'passive' as const, descentRate_mps: 3.2 };
const HOMING = {
  id: 'seeker',
  guidance: 'homing' as const,
  descentRate_mps: 2.9,
  glideAngle_deg: 42,
  controlTime_s: 30,
  entryLoss_m: 6,
};

/** The passive landing offset from the release point, built as the planner's docs describe. */
function passiveOffsetFor(file: Partial<PlanFile> & { speed: number; track: number }) {
  const ground = 60;
  const wind = new WindProfile(LAYERS, { reference: 'AGL', groundElevation_m: ground });
  const top = 120 + ground;
  const wt = wind.at(top);
  const s: FlightSetup = {
    table: new FallTable({
      top_m: top,
      bottom_m: ground,
      descentRateSL_mps: PASSIVE.descentRate_mps,
      entryLoss_m: 0,
      isaOffset_K: 0,
      wind,
    }),
    guidance: 'passive',
    cotGamma: 0,
    controlTime_s: 0,
    carrier: {
      x: file.speed * Math.sin(file.track * DEG),
      y: file.speed * Math.cos(file.track * DEG),
    },
    windTop: { x: wt.east_mps, y: wt.north_mps },
  };
  return passiveOffset(s);
}

function movingPlan(
  variants: PlanFile['variants'],
  site: { x: number; y: number },
  tol: number,
  extra: Partial<PlanFile> = {},
) {
  return makePlan({
    groundElevation_m: 60,
    winds: { reference: 'AGL', layers: LAYERS },
    release: { ...RELEASE, altitude_m: 120, reference: 'AGL' },
    carrier: { groundSpeed_mps: 12, trackDeg: 60 },
    variants,
    sites: [{ id: 's', ...offsetLatLng(RELEASE, site.x, site.y), tolerance_m: tol }],
    // Still air unless a test sets its own uncertainty: the closed forms below have no gusts.
    uncertainty: { turbulence: 'none' },
    ...extra,
  });
}

describe('passive release window on a moving carrier', () => {
  // Closed form: releasing s seconds after the plan point lands at s·V·u + L (L the passive
  // offset); with q = L − site split into along-track a and cross-track c, the landing is within
  // tol of the site while (a + sV)² + c² ≤ tol², i.e. for s in (−a ∓ √(tol² − c²))/V.
  // Sites are placed by along/across-track offsets from the passive landing of the plan point.
  for (const [label, along, across, tol] of [
    ['a site just beside the landing line', 60, 4, 15],
    ['a site near the chord edge', 20, -23.5, 25],
    ['a site behind the release point', -150, 0, 12],
  ] as const) {
    it(`the release window equals the chord of the tolerance circle (${label})`, () => {
      const V = 12;
      const u = { x: Math.sin(60 * DEG), y: Math.cos(60 * DEG) };
      const off = passiveOffsetFor({ speed: V, track: 60 });
      const site = {
        x: off.x + along * u.x + across * u.y,
        y: off.y + along * u.y - across * u.x,
      };
      const q = { x: off.x - site.x, y: off.y - site.y };
      const a = q.x * u.x + q.y * u.y;
      const c = q.x * u.y - q.y * u.x;
      expect(Math.abs(c)).toBeLessThan(tol); // the track passes within reach of a hit
      const h = Math.sqrt(tol * tol - c * c);
      const r = planDrop(movingPlan([PASSIVE], site, tol)).sites[0];
      expect(r.releaseWindow).not.toBeNull();
      const w = r.releaseWindow!;
      // 1e-6 s = 12 µm along track; the site's lat/lon round trip adds ~0.1 mm (geodesy tests).
      expectClose(w.open_s, (-a - h) / V, 2e-5, 'open');
      expectClose(w.close_s, (-a + h) / V, 2e-5, 'close');
      expectClose(w.best_s, -a / V, 2e-5, 'best');
      expect(r.pHit).toBe(1);
      expect(r.releaseZone).toBeNull();
      // The best release point is best_s·V along the track from the plan's release point.
      expectNearLatLng(
        w.best,
        offsetLatLng(RELEASE, u.x * V * w.best_s, u.y * V * w.best_s),
        0.001,
      );
    });
  }

  it('has no window when the track passes farther than the tolerance from a hit', () => {
    const off = passiveOffsetFor({ speed: 12, track: 60 });
    const u = { x: Math.sin(60 * DEG), y: Math.cos(60 * DEG) };
    // 40 m across the track from the passive landing line, tolerance 10 m.
    const site = { x: off.x + 40 * u.y, y: off.y - 40 * u.x };
    const r = planDrop(movingPlan([PASSIVE], site, 10)).sites[0];
    expect(r.releaseWindow).toBeNull();
    expect(r.pHit).toBe(0);
    expect(r.reachable).toBe(false);
    expectClose(r.nominalMiss_m, 40, 0.01, 'closest miss');
  });
});

describe('hitProfile on hand-made samples', () => {
  // Hand-worked: unit (1, 0), speed 1, tol 5, site (0, 0).
  // (0, 0): along 0, across 0 → chord [−5, 5]. (2, 3): along 2, across −3, half-chord 4 → [−6, 2].
  // (10, 6): across −6 > 5 → never hits. n = 3.
  const xs = Float64Array.from([0, 2, 10]);
  const ys = Float64Array.from([0, 3, 6]);

  it('gives the exact step function of P(hit) against the shift', () => {
    const pr = hitProfile(xs, ys, { x: 0, y: 0 }, 5, { x: 1, y: 0 }, 1);
    expect(Array.from(pr.s)).toEqual([-6, -5, 2, 5]);
    expect(Array.from(pr.p)).toEqual([1 / 3, 2 / 3, 1 / 3, 0]);
    expect(profileAt(pr, -7)).toBe(0);
    expect(profileAt(pr, -5.5)).toBe(1 / 3);
    expect(profileAt(pr, 0)).toBe(2 / 3);
    expect(profileAt(pr, 3)).toBe(1 / 3);
    expect(profileAt(pr, 6)).toBe(0);
  });

  it('divides shifts by the carrier speed to give seconds', () => {
    const pr = hitProfile(xs, ys, { x: 0, y: 0 }, 5, { x: 1, y: 0 }, 4);
    expect(Array.from(pr.s)).toEqual([-1.5, -1.25, 0.5, 1.25]);
  });

  it('works along any track: rotating samples and track together gives the same profile', () => {
    const t = 37 * DEG;
    const rot = (x: number, y: number) => ({
      x: x * Math.cos(t) - y * Math.sin(t),
      y: x * Math.sin(t) + y * Math.cos(t),
    });
    const pts = [0, 1, 2].map((i) => rot(xs[i], ys[i]));
    const site = { x: 3, y: -2 };
    const pr = hitProfile(
      Float64Array.from(pts, (p) => p.x + site.x),
      Float64Array.from(pts, (p) => p.y + site.y),
      site,
      5,
      rot(1, 0),
      1,
    );
    [-6, -5, 2, 5].forEach((v, i) => expectClose(pr.s[i], v, 1e-12, `s[${i}]`));
    expect(Array.from(pr.p)).toEqual([1 / 3, 2 / 3, 1 / 3, 0]);
  });
});

describe('best shift and the run around it', () => {
  // Hand-made: P = ½ on [0,1), 1 on [1,3), ½ on [3,4), 1 on [4,10), ½ on [10,12), 0 after.
  const pr: HitProfile = {
    s: Float64Array.from([0, 1, 3, 4, 10, 12]),
    p: Float64Array.from([0.5, 1, 0.5, 1, 0.5, 0]),
  };

  it('bestShift takes the middle of the widest stretch at the maximum', () => {
    expect(bestShift(pr)).toEqual({ shift: 7, pHit: 1 });
  });

  it('bestShift of a profile that never hits is NaN with P(hit) 0', () => {
    const none = bestShift({ s: new Float64Array(0), p: new Float64Array(0) });
    expect(none.pHit).toBe(0);
    expect(none.shift).toBeNaN();
  });

  it('runAround returns the stretch meeting the requirement around a shift, or null', () => {
    expect(runAround(pr, 7, 0.9)).toEqual([4, 10]);
    expect(runAround(pr, 2, 0.9)).toEqual([1, 3]);
    expect(runAround(pr, 7, 0.5)).toEqual([0, 12]);
    expect(runAround(pr, 3.5, 0.9)).toBeNull();
    expect(runAround(pr, 13, 0.1)).toBeNull();
  });
});

describe('homing release window', () => {
  // Site 100 m along the track and 30 m to its left from the passive landing of the plan point.
  const siteFor = () => {
    const u = { x: Math.sin(60 * DEG), y: Math.cos(60 * DEG) };
    const off = passiveOffsetFor({ speed: 12, track: 60 });
    return { x: off.x + 100 * u.x - 30 * u.y, y: off.y + 100 * u.y + 30 * u.x };
  };
  it('contains the best release time, where P(hit) meets requiredPHit', () => {
    const r = planDrop(
      movingPlan([HOMING], siteFor(), 10, {
        uncertainty: { windSpeed_mps: 0.5, releasePosition_m: 2, releaseTiming_s: 0.2 },
        monteCarlo: { samples: 300, seed: 9 },
        requiredPHit: 0.8,
      }),
    ).sites[0];
    expect(r.reachable).toBe(true);
    expect(r.pHit).toBeGreaterThanOrEqual(0.8);
    expect(r.releaseWindow).not.toBeNull();
    const w = r.releaseWindow!;
    expect(w.open_s).toBeLessThan(w.best_s);
    expect(w.best_s).toBeLessThan(w.close_s);
  });

  // With no error, homing lands on the site when it is within the reach of the uncontrolled
  // landing and falls short by (distance − reach) beyond it, so it hits while the site is within
  // reach + tol: the window is the chord of that circle. Tolerance: the bisection's error, at most
  // span/2⁷ with span = (reach + tol + 50)/V (docs/model.md §9: 7 halvings, reported midpoint
  // within span/2⁸; one halving of margin).
  it('in zero uncertainty spans about the chord of the reach-plus-tolerance circle', () => {
    const V = 12;
    const tol = 10;
    const site = siteFor();
    const r = planDrop(movingPlan([HOMING], site, tol)).sites[0];
    const R = r.reachRadius_m + tol;
    const u = { x: Math.sin(60 * DEG), y: Math.cos(60 * DEG) };
    const nominal = localOf(r.nominalLanding);
    const rel = localOf(r.release);
    // q = L − site, L the uncontrolled landing offset from the release used (homing takes no shift).
    const q = { x: nominal.x - rel.x - site.x, y: nominal.y - rel.y - site.y };
    const a = q.x * u.x + q.y * u.y;
    const c = q.x * u.y - q.y * u.x;
    const h = Math.sqrt(R * R - c * c);
    const slack = (R + 50) / V / 128;
    expect(r.releaseWindow).not.toBeNull();
    expectClose(r.releaseWindow!.open_s, (-a - h) / V, slack, 'open');
    expectClose(r.releaseWindow!.close_s, (-a + h) / V, slack, 'close');
  });
});

describe('hovering carrier', () => {
  const hover = (variants: PlanFile['variants'], tol: number) =>
    makePlan({
      groundElevation_m: 60,
      winds: { reference: 'AGL', layers: LAYERS },
      release: { ...RELEASE, altitude_m: 120, reference: 'AGL' },
      carrier: { groundSpeed_mps: 0, trackDeg: 0 },
      variants,
      sites: [{ id: 's', ...offsetLatLng(RELEASE, 80, -30), tolerance_m: tol }],
      // Still air: the zone sizes below are those of no error at all.
      uncertainty: { turbulence: 'none' },
      monteCarlo: { samples: 100, seed: 3 },
    });

  it('gives no release window and a zone whose centre’s nominal landing is on the site', () => {
    const r = planDrop(hover([PASSIVE], 10)).sites[0];
    expect(r.releaseWindow).toBeNull();
    expect(r.releaseZone).not.toBeNull();
    // Hovering, the site is planned from the zone centre, whose uncontrolled landing is the site.
    const c = localOf(r.releaseZone!.center);
    const rel = localOf(r.release);
    expectClose(rel.x, c.x, 0.01, 'release east');
    expectClose(rel.y, c.y, 0.01, 'release north');
    const L = localOf(r.nominalLanding);
    expectClose(L.x, 80, 0.01, 'east');
    expectClose(L.y, -30, 0.01, 'north');
    // The centre sits upwind of the site by the drift: not at the plan's release point.
    expect(Math.hypot(c.x, c.y)).toBeGreaterThan(20);
    // With no error, the zone is the tolerance disc: radius = tol to the bisection's error,
    // at most (tol + 50)/2⁸ = 0.23 m for 7 or more halvings from (tol + 50) m.
    expectClose(r.releaseZone!.radius_m, 10, 60 / 256, 'radius');
  });

  it('a homing variant holds a zone as wide as its reach plus the tolerance', () => {
    const r = planDrop(hover([HOMING], 10)).sites[0];
    expect(r.releaseWindow).toBeNull();
    const R = r.reachRadius_m + 10;
    // Homing hits while the site is within reach + tol (see the window test above); bisection
    // error ≤ (R + 50)/2⁸ (8 halvings from R + 50 m, docs/model.md §9), doubled for margin.
    expectClose(r.releaseZone!.radius_m, R, (R + 50) / 128, 'radius');
  });
});
