import { describe, expect, it } from 'vitest';
import type { PlanFile } from '../../app/plan/plan';
import { planFingerprint } from '../../app/plan/fingerprint';
import { planSafety } from '../../app/safety/plan-safety';
import { planDrop } from '../../app/planner/planner';
import { DEFAULT_MANUAL_ITEMS } from '../../app/safety/readiness';
import { validatePlan } from '../../app/plan/validate';
import demo from '../../data/demo-plan.json';

function evaluate(file: PlanFile) {
  const v = validatePlan(file);
  if (!v.ok) throw new Error(v.errors.map((e) => e.message).join('; '));
  return { plan: v.plan, safety: planSafety(v.plan, planDrop(v.plan)) };
}

/** The demo with a few samples, every crew item done, signed off for its current failing checks. */
function signedDemo(mutate: (d: PlanFile) => void = () => {}): PlanFile {
  const d = structuredClone(demo) as unknown as PlanFile;
  d.monteCarlo = { samples: 100, seed: 1 };
  d.safety = {
    ...d.safety,
    checklist: DEFAULT_MANUAL_ITEMS.map((m) => ({ ...m, state: 'done' as const, who: 'R. Ilves' })),
  };
  const { plan, safety } = evaluate(d);
  const failing = safety.checks.filter((c) => c.status === 'fail').map((c) => c.id);
  d.safety.signoff = {
    who: 'T. Nagy',
    when: '2026-12-01T08:00',
    reason: 'Best-effort sites accepted by the survey lead.',
    covers: failing,
    planHash: planFingerprint(plan),
  };
  mutate(d);
  return d;
}

describe('the ready sign-off', () => {
  it('makes the plan ready when it covers every failing check and the crew items are done', () => {
    const { safety } = evaluate(signedDemo());
    expect(safety.checks.some((c) => c.status === 'fail')).toBe(true); // the demo has failing checks
    expect(safety.signoffCurrent).toBe(true);
    expect(safety.signedReady).toBe(true);
    expect(safety.readiness.overridden).toBe(true);
  });

  it('is void once the plan changes after signing', () => {
    const d = signedDemo((x) => {
      x.sites[0].tolerance_m = 12;
    });
    const { safety } = evaluate(d);
    expect(safety.signoffCurrent).toBe(false);
    expect(safety.signedReady).toBe(false);
  });

  it('does not excuse a check that starts failing later, even with the fingerprint updated', () => {
    const d = signedDemo((x) => {
      // A wind limit below the demo's winds makes the wind check fail as well.
      x.variants.forEach((v) => (v.maxWind_mps = 2));
    });
    const { plan } = evaluate(d);
    d.safety!.signoff!.planHash = planFingerprint(plan);
    const { safety } = evaluate(d);
    expect(safety.checks.find((c) => c.id === 'wind-limit')?.status).toBe('fail');
    expect(safety.signoffCurrent).toBe(true);
    expect(safety.signedReady).toBe(false);
    expect(safety.readiness.blocking).toContain('check:wind-limit');
  });

  it('fingerprints ignore the sign-off itself but see every other edit', () => {
    const a = evaluate(signedDemo()).plan;
    const b = structuredClone(a);
    b.safety!.signoff = { who: 'someone else', when: 'later' };
    expect(planFingerprint(b)).toBe(planFingerprint(a));
    b.winds.layers[0].speed_mps += 0.1;
    expect(planFingerprint(b)).not.toBe(planFingerprint(a));
  });
});
