// Which variant a site gets (docs/model.md §10): the cheapest that meets requiredPHit, ties in
// catalogue order; when none meets it, the highest P(hit), said as such; when none can reach the
// site at all, that is said instead of naming a choice.
import type { ResolvedVariant } from '../plan';

/** Why a site's recommended variant is what it is. */
export interface Recommendation {
  /** The recommended variant id (for data continuity even when none meets or reaches). */
  variant: string;
  /** `meets`: it meets requiredPHit; `below`: none does, it has the highest P(hit); `unreachable`: no variant can reach the site. */
  kind: 'meets' | 'below' | 'unreachable';
  /** One sentence for the crew. */
  why: string;
}

/** What the rule needs of each variant's result, in catalogue order. */
export interface Candidate {
  variant: string;
  pHit: number;
  reachable: boolean;
}

const p2 = (x: number): string => x.toFixed(2);

/** The recommendation among `results` (catalogue order) with each variant's cost (default 0). */
export function recommend(
  results: readonly Candidate[],
  variants: readonly ResolvedVariant[],
  requiredPHit: number,
): Recommendation {
  const cost = (id: string): number => variants.find((v) => v.id === id)?.cost ?? 0;
  const meeting = results.filter((r) => r.pHit >= requiredPHit);
  if (meeting.length > 0) {
    // Stable: the first of the cheapest in catalogue order.
    let best = meeting[0];
    for (const r of meeting) if (cost(r.variant) < cost(best.variant)) best = r;
    const req = `P(hit) ≥ ${p2(requiredPHit)}`;
    if (meeting.length === 1)
      return { variant: best.variant, kind: 'meets', why: `the only variant that meets ${req}` };
    const costs = new Set(meeting.map((r) => cost(r.variant)));
    if (costs.size === 1) {
      return {
        variant: best.variant,
        kind: 'meets',
        why: `the first in catalogue order of ${meeting.length} variants that meet ${req} at equal cost`,
      };
    }
    const next = Math.min(
      ...meeting.filter((r) => r.variant !== best.variant).map((r) => cost(r.variant)),
    );
    return {
      variant: best.variant,
      kind: 'meets',
      why: `the cheapest of ${meeting.length} variants that meet ${req} (cost ${cost(best.variant)}; next ${next})`,
    };
  }
  const top = results.reduce((a, b) => (b.pHit > a.pHit ? b : a));
  if (!results.some((r) => r.reachable)) {
    return {
      variant: top.variant,
      kind: 'unreachable',
      why: 'no variant can reach this site from the planned release',
    };
  }
  return {
    variant: top.variant,
    kind: 'below',
    why: `no variant meets P(hit) ≥ ${p2(requiredPHit)}; this one has the highest (${p2(top.pHit)})`,
  };
}
