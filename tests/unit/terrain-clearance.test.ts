// The carrier's height above the terrain (safety check `terrain-clearance`, docs/model.md §15):
// real planner results of small plans with a hand-made PlanResult.terrain, so every height
// above the ground is release altitude MSL − ground, worked by hand.
import { describe, expect, it } from 'vitest';
import { type ElevationModel, type LatLon, LocalFrame, sampledGround } from '../../app/model';
import type { PlanFile } from '../../app/plan/plan';
import { validatePlan } from '../../app/plan/validate';
import { planDrop, type CarrierGroundPoint, type PlanResult } from '../../app/planner';
import {
  DEFAULT_SAFETY_SETTINGS,
  planSafety,
  safetyChecks,
  safetySettingsOf,
  type CheckResult,
  type SafetySettings,
} from '../../app/safety';
import { NOW, RELEASE, offsetLatLng } from './helpers';

/** A plan file: release 100 m above ground at 500 m MSL, calm, two sites, hovering. */
function file(over: Partial<PlanFile> = {}): PlanFile {
  return {
    format: 'seedfall-plan',
    version: 1,
    name: 'clearance test',
    time: NOW.toISOString(),
    groundElevation_m: 500,
    release: { lat: RELEASE.lat, lon: RELEASE.lon, altitude_m: 100, reference: 'AGL' },
    carrier: { groundSpeed_mps: 0, trackDeg: 0 },
    winds: { reference: 'AGL', layers: [] },
    variants: [{ id: 'drifter', guidance: 'passive', descentRate_mps: 3 }],
    sites: [
      { id: 's1', name: 'North pool', ...offsetLatLng(RELEASE, 0, 200) },
      { id: 's2', ...offsetLatLng(RELEASE, 300, 0) },
    ],
    monteCarlo: { samples: 200, seed: 7 },
    ...over,
  };
}

function plan(over: Partial<PlanFile> = {}) {
  const v = validatePlan(file(over), { now: NOW });
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  return v.plan;
}

const hoverPlan = plan();
const hoverResult = planDrop(hoverPlan, { probeSamples: 64 });

/** The result with a hand-made terrain section (the planner's own is what the lead fills in). */
function withTerrain(result: PlanResult, carrier: CarrierGroundPoint[]): PlanResult {
  const known = carrier.map((p) => p.ground_m).filter((g): g is number => g !== null);
  return {
    ...result,
    terrain: {
      name: 'hand-made.asc',
      carrier,
      carrierGroundMin_m: known.length ? Math.min(...known) : null,
      carrierGroundMax_m: known.length ? Math.max(...known) : null,
    },
  };
}

/** Hover points of both sites over the given grounds (MSL). */
function hover(g1: number | null, g2: number | null): CarrierGroundPoint[] {
  const at = (id: string) => hoverResult.sites.find((s) => s.id === id)!.releaseZone!.center;
  return [
    { ...at('s1'), ground_m: g1, kind: 'hover', site: 's1' },
    { ...at('s2'), ground_m: g2, kind: 'hover', site: 's2' },
  ];
}

function check(result: PlanResult, settings: Partial<SafetySettings> = {}): CheckResult {
  const report = safetyChecks(hoverPlan, result, { ...DEFAULT_SAFETY_SETTINGS, ...settings });
  const c = report.checks.find((x) => x.id === 'terrain-clearance');
  if (!c) throw new Error('no terrain-clearance check');
  return c;
}

describe('terrain clearance check', () => {
  it('sits right after the ceiling check', () => {
    const ids = safetyChecks(hoverPlan, hoverResult).checks.map((c) => c.id);
    expect(ids.indexOf('terrain-clearance')).toBe(ids.indexOf('ceiling') + 1);
  });

  it('is n/a without an elevation model', () => {
    const c = check(hoverResult);
    expect(c.status).toBe('n/a');
    expect(c.why).toMatch(/without an elevation model/);
  });

  it('passes when the carrier stays between the clearance and the ceiling', () => {
    expect(hoverResult.releaseAltitudeMSL_m).toBe(600);
    // 600 − 560 = 40 m ≥ 30 m; 600 − 490 = 110 m ≤ 120 m (hand arithmetic).
    const c = check(withTerrain(hoverResult, hover(560, 490)));
    expect(c.status).toBe('pass');
    expect(c.numbers.leastAboveGround_m).toBe(40);
    expect(c.numbers.mostAboveGround_m).toBe(110);
    expect(c.numbers.clearanceSetting_m).toBe(30); // default: common practice
    expect(c.sites).toEqual([]);
    expect(c.why).toMatch(/40–110 m above the terrain of hand-made\.asc/);
  });

  it('fails where a hill brings the carrier under the clearance, naming the point and site', () => {
    // s2's hover point over ground at 585 m MSL: 600 − 585 = 15 m < 30 m.
    const pts = hover(520, 585);
    const c = check(withTerrain(hoverResult, pts));
    expect(c.status).toBe('fail');
    expect(c.sites).toEqual(['s2']);
    expect(c.numbers.worstAboveGround_m).toBe(15);
    expect(c.numbers.worstGround_m).toBe(585);
    expect(c.numbers.worstLat).toBeCloseTo(pts[1].lat, 6);
    expect(c.numbers.worstLon).toBeCloseTo(pts[1].lon, 6);
    expect(c.why).toContain(`${pts[1].lat.toFixed(5)}, ${pts[1].lon.toFixed(5)}`);
    expect(c.why).toMatch(/ground 585 m MSL, carrier 15 m above it\) \(release for s2\)/);
    expect(c.items).toEqual([
      expect.objectContaining({ site: 's2', ground_m: 585, aboveGround_m: 15, status: 'fail' }),
    ]);
    // The same point passes once the setting is lowered to 10 m.
    expect(check(withTerrain(hoverResult, pts), { terrainClearance_m: 10 }).status).toBe('pass');
  });

  it('fails where a valley under the carrier puts it above the ceiling', () => {
    // s1's hover point over a valley floor at 470 m MSL: 600 − 470 = 130 m > 120 m ceiling,
    // though the release is 100 m above the plan ground (the ceiling check passes).
    const c = check(withTerrain(hoverResult, hover(470, 520)));
    expect(c.status).toBe('fail');
    expect(c.sites).toEqual(['s1']);
    expect(c.numbers.worstAboveGround_m).toBe(130);
    expect(c.why).toMatch(/more than the ceiling setting of 120 m above the terrain/);
    expect(c.why).toContain('release for s1 “North pool”');
    const ceiling = safetyChecks(hoverPlan, withTerrain(hoverResult, hover(470, 520))).checks.find(
      (x) => x.id === 'ceiling',
    );
    expect(ceiling?.status).toBe('pass');
    // A 150 m ceiling setting lets it pass.
    expect(check(withTerrain(hoverResult, hover(470, 520)), { ceiling_m: 150 }).status).toBe(
      'pass',
    );
  });

  it('warns where the model has no height under the carrier, naming the site', () => {
    const c = check(withTerrain(hoverResult, hover(520, null)));
    expect(c.status).toBe('warn');
    expect(c.sites).toEqual(['s2']);
    expect(c.numbers.unknownGround).toBe(1);
    expect(c.why).toMatch(/no height under 1 of 2 carrier points/);
    // A failing point still fails with unknown ground elsewhere.
    expect(check(withTerrain(hoverResult, hover(590, null))).status).toBe('fail');
  });

  it('gives a track point to the sites whose release window holds its time', () => {
    // Both sites on the track (east), 100 m and 400 m out: their windows are apart.
    const moving = plan({
      carrier: { groundSpeed_mps: 10, trackDeg: 90 },
      sites: [
        { id: 's1', ...offsetLatLng(RELEASE, 100, 0) },
        { id: 's2', ...offsetLatLng(RELEASE, 400, 0) },
      ],
    });
    const result = planDrop(moving, { probeSamples: 64 });
    const frame = new LocalFrame(result.releasePoint);
    const { unit, groundSpeed_mps: v } = result.track;
    const windows = result.sites.map((s) => s.releaseWindow);
    expect(windows.every((w) => w !== null)).toBe(true);
    const pointAt = (t: number, ground_m: number): CarrierGroundPoint => ({
      ...frame.toLatLon(unit.x * v * t, unit.y * v * t),
      ground_m,
      kind: 'track',
    });
    // Track points every 0.5 s over both windows; one hill (585 m MSL) inside s2's window only.
    const w2 = windows[1]!;
    const w1 = windows[0]!;
    const hill = (w2.open_s + w2.close_s) / 2;
    expect(hill < w1.open_s - 1 || hill > w1.close_s + 1).toBe(true);
    const pts: CarrierGroundPoint[] = [];
    const t0 = Math.min(w1.open_s, w2.open_s);
    const t1 = Math.max(w1.close_s, w2.close_s);
    for (let t = t0; t <= t1; t += 0.5) pts.push(pointAt(t, 520));
    pts.push(pointAt(hill, 585));
    const checked = safetyChecks(moving, withTerrain(result, pts)).checks.find(
      (x) => x.id === 'terrain-clearance',
    )!;
    expect(checked.status).toBe('fail');
    expect(checked.sites).toEqual(['s2']);
    expect(checked.numbers.worstAboveGround_m).toBe(15);
  });

  it('reads its setting from the plan, and the schema holds it in range', () => {
    const p = plan({ safety: { terrainClearance_m: 55 } });
    expect(safetySettingsOf(p).terrainClearance_m).toBe(55);
    expect(safetySettingsOf(hoverPlan).terrainClearance_m).toBe(30);
    // 600 − 560 = 40 m < 55 m: the plan's own setting fails it.
    const s = planSafety(p, withTerrain(planDrop(p, { probeSamples: 64 }), hover(560, 520)));
    expect(s.checks.find((c) => c.id === 'terrain-clearance')?.status).toBe('fail');
    const bad = validatePlan(file({ safety: { terrainClearance_m: -1 } }), { now: NOW });
    expect(bad.ok).toBe(false);
    if (!bad.ok) {
      expect(bad.errors).toEqual([
        {
          path: 'safety.terrainClearance_m',
          message: 'safety.terrainClearance_m must be between 0 and 10000',
        },
      ]);
    }
  });

  it('checks the ground the planner found under the hover points of a plan over a slope', () => {
    // Ground rising 0.1 m per m to the north from 500 m MSL at the release point: the hover
    // point of s1 (about 200 m north) is over ground near 520 m, s2's (east) near 500 m.
    const frame = new LocalFrame(RELEASE);
    const h = (p: LatLon) => 500 + 0.1 * frame.toLocal(p).y;
    const slope: ElevationModel = {
      name: 'slope.asc',
      sample: h,
      localGround: (f, box) => sampledGround((x, y) => h(f.toLatLon(x, y)), box, 5),
    };
    const result = planDrop(hoverPlan, { probeSamples: 64, terrain: slope });
    const pts = result.terrain?.carrier ?? [];
    expect(pts.map((p) => p.site)).toEqual(['s1', 's2']);
    const above = pts.map((p) => 600 - h(p));
    const c = check(result, { terrainClearance_m: 90 });
    // 600 − (500 + 0.1·y): s1 about 80 m above its ground (< 90 m: fail), s2 about 100 m.
    expect(c.status).toBe('fail');
    expect(c.sites).toEqual(['s1']);
    expect(c.numbers.worstAboveGround_m).toBeCloseTo(above[0], 1);
    expect(c.numbers.mostAboveGround_m).toBeCloseTo(above[1], 1);
    expect(check(result).status).toBe('pass');
  }, 120_000);
});
