import { describe, expect, it } from 'vitest';
import { formatPlanText } from '../../app/brief/report-text';
import { planDrop } from '../../app/planner/planner';
import { validatePlan } from '../../app/plan/validate';
import demo from '../../data/demo-plan.json';
import { NOW } from './helpers';

const SAMPLES = 200;

function report(patch: (u: Record<string, unknown>) => void = () => {}) {
  const d = structuredClone(demo);
  patch(d.uncertainty as Record<string, unknown>);
  d.monteCarlo.samples = SAMPLES;
  const v = validatePlan(d, { now: NOW });
  if (!v.ok) throw new Error(v.errors.map((e) => e.message).join('; '));
  const result = planDrop(v.plan);
  return { result, text: formatPlanText(v.plan, result) };
}

describe('the text report', () => {
  const { result, text } = report();

  it('gives every site’s P(hit) ± the binomial standard error of its samples', () => {
    const lines = text.split('\n');
    for (const s of result.sites) {
      const line = lines.find((l) => l.startsWith(`${s.id} `))!;
      // Standard error of a share p of n samples, √(p(1−p)/n) (common practice); two decimals,
      // "<0.01" when it rounds to 0.00.
      const se = Math.sqrt((s.pHit * (1 - s.pHit)) / SAMPLES);
      expect(line).toContain(`${s.pHit.toFixed(2)} ± ${se < 0.005 ? '<0.01' : se.toFixed(2)}`);
    }
    expect(text).toContain('± = Monte Carlo standard error of P(hit)');
  });

  it('names the error sources it includes, each with its size', () => {
    // The demo plan leaves turbulence at its default, auto: gusts and vertical air are modelled.
    expect(text).toContain(
      'Included error sources: forecast wind error, gusts, vertical air, descent rate',
    );
    expect(text).toMatch(/^ {2}gusts: modelled: turbulence from the plan's wind at 20 ft/m);
    expect(text).toMatch(/^ {2}forecast wind error: 0\.7 m\/s per component/m);
  });

  it('leaves gusts and vertical air out when turbulence is none and nothing is set', () => {
    const calm = report((u) => {
      u.turbulence = 'none';
    }).text;
    const line = calm.split('\n').find((l) => l.startsWith('Included error sources'))!;
    expect(line).not.toContain('gusts');
    expect(line).not.toContain('vertical air');
    expect(line).toContain('forecast wind error');
  });

  it('says when no error source is included', () => {
    const none = report((u) => {
      Object.assign(u, {
        turbulence: 'none',
        windSpeed_mps: 0,
        descentRate_pct: 0,
        releasePosition_m: 0,
        heading_deg: 0,
        releaseTiming_s: 0,
      });
    });
    expect(none.text).toContain('Included error sources: none (every flight is the nominal one).');
    // Every sample is the nominal flight: P(hit) is 0 or 1 with no sampling error.
    for (const s of none.result.sites) expect([0, 1]).toContain(s.pHit);
  });

  it('says "no variant can reach this site" instead of naming one, and why each site has its variant', () => {
    const lines = text.split('\n');
    for (const s of result.sites) {
      const row = lines.find((l) => l.startsWith(`${s.id} `))!;
      if (s.recommendation.kind === 'unreachable' && !s.pinned) {
        expect(row).toContain('no variant can reach this site');
        expect(row).not.toContain(s.variant);
      } else {
        expect(row).toContain(s.variant);
      }
      const why = lines.find((l) => l.startsWith(`  ${s.id}: `))!;
      expect(why).toContain(s.pinned ? 'pinned in the plan' : s.recommendation.why);
    }
    // The demo plan has an unpinned site no variant can reach (s11, beyond every reach area).
    expect(result.sites.some((s) => s.recommendation.kind === 'unreachable' && !s.pinned)).toBe(
      true,
    );
  });
});
