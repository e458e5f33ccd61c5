// A crew item is done only with a person's name: readiness, the plan's warnings and the words
// that say what blocks the plan. The rule is ours (common practice: a checklist tick says who).
import { describe, expect, it } from 'vitest';
import type { PlanFile } from '../../app/plan/plan';
import { planFingerprint } from '../../app/plan/fingerprint';
import { validatePlan } from '../../app/plan/validate';
import { planDrop } from '../../app/planner/planner';
import { blockingText, planSafety } from '../../app/safety/plan-safety';
import {
  DEFAULT_MANUAL_ITEMS,
  doneWithoutName,
  readiness,
  type ManualItem,
} from '../../app/safety/readiness';
import type { CheckResult } from '../../app/safety/safety';
import demo from '../../data/demo-plan.json';

const pass: CheckResult = { id: 'ceiling', title: 'c', status: 'pass', why: '', numbers: {} };
const named = (): ManualItem[] =>
  DEFAULT_MANUAL_ITEMS.map((m) => ({ ...m, state: 'done', who: 'K. Aalto' }));

describe('a crew item needs a name to be done', () => {
  it('counts a done item with no name, or a blank one, as open', () => {
    const items = named();
    expect(readiness([pass], items).ready).toBe(true);
    const noName = items.map((m, i) => (i === 2 ? { ...m, who: undefined } : m));
    expect(readiness([pass], noName)).toEqual({
      ready: false,
      blocking: [`manual:${items[2].id}`],
      overridden: false,
    });
    const blank = items.map((m, i) => (i === 5 ? { ...m, who: '   ' } : m));
    expect(readiness([pass], blank).blocking).toEqual([`manual:${items[5].id}`]);
    // An override for failing checks never covers it.
    const fail: CheckResult = { ...pass, id: 'p-hit', status: 'fail' };
    expect(readiness([fail], noName, { reason: 'accepted', who: 'B', when: 'now' }).ready).toBe(
      false,
    );
  });

  it('lets an item marked not applicable stand without a name', () => {
    const items = named().map((m, i) =>
      i === 0 ? { ...m, state: 'n/a' as const, who: undefined } : m,
    );
    expect(readiness([pass], items).ready).toBe(true);
    expect(doneWithoutName(items[0])).toBe(false);
    expect(doneWithoutName({ state: 'done' })).toBe(true);
    expect(doneWithoutName({ state: 'done', who: 'X' })).toBe(false);
    expect(doneWithoutName({ state: 'open' })).toBe(false);
  });

  it('loads a plan with such an item as it is, warns about it, and keeps it from being ready', () => {
    const d = structuredClone(demo) as unknown as PlanFile;
    d.monteCarlo = { samples: 50, seed: 1 };
    d.safety = { ...d.safety, checklist: named() };
    delete d.safety.checklist![3].who;
    const v = validatePlan(d);
    if (!v.ok) throw new Error(JSON.stringify(v.errors));
    // Shown, not silently fixed: the item keeps its state and no name is filled in.
    expect(v.plan.safety!.checklist![3]).toMatchObject({ state: 'done' });
    expect(v.plan.safety!.checklist![3].who).toBeUndefined();
    expect(v.warnings).toContain(
      'safety.checklist[3] is done but who is empty; it counts as open until someone is named',
    );
    // Signed off for every failing check and this very plan: still not ready.
    const first = planSafety(v.plan, planDrop(v.plan, { probeSamples: 32 }));
    d.safety.signoff = {
      who: 'T. Nagy',
      when: '2026-12-01T08:00',
      reason: 'Best-effort sites accepted.',
      covers: first.checks.filter((c) => c.status === 'fail').map((c) => c.id),
      planHash: planFingerprint(v.plan),
    };
    const again = validatePlan(d);
    if (!again.ok) throw new Error('invalid');
    const s = planSafety(again.plan, planDrop(again.plan, { probeSamples: 32 }));
    expect(s.signoffCurrent).toBe(true);
    expect(s.signedReady).toBe(false);
    const item = DEFAULT_MANUAL_ITEMS[3];
    expect(s.readiness.blocking).toEqual([`manual:${item.id}`]);
    expect(blockingText(s)).toEqual([`crew item marked done with nobody named: ${item.text}`]);
  });

  it('gives no warning for named or open items', () => {
    const d = structuredClone(demo) as unknown as PlanFile;
    d.safety = { ...d.safety, checklist: [...named(), { id: 'x', text: 'x', state: 'open' }] };
    const v = validatePlan(d);
    if (!v.ok) throw new Error('invalid');
    expect(v.warnings.filter((w) => w.startsWith('safety.checklist'))).toEqual([]);
  });
});
