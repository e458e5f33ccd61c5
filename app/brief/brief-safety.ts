// The safety analysis as the printed brief shows it.
import type { BriefSafety } from './brief-html';
import { blockingText, type PlanSafety } from '../safety';

/** The safety part of the printed brief. */
export function briefSafety(s: PlanSafety): BriefSafety {
  const geom = s.hazardArea.geometry;
  const polys = geom.type === 'Polygon' ? [geom.coordinates] : geom.coordinates;
  const open = s.checklist.filter((m) => m.state === 'open').length;
  return {
    checks: s.checks.map((c) => ({ id: c.id, title: c.title, status: c.status, why: c.why })),
    hazardRings: polys.map((p) => p[0].map(([lon, lat]) => [lat, lon] as [number, number])),
    hazardArea_m2: s.hazardArea_m2,
    manual: s.checklist,
    readiness: {
      ready: s.signedReady,
      overridden: s.readiness.overridden,
      reason: s.signoff?.reason,
      who: s.signoff?.who,
      when: s.signoff?.when,
      blocking: [
        ...blockingText(s, 'check'),
        ...(open > 0 ? [`${open} crew item(s) open`] : []),
        ...(s.signoffCurrent
          ? []
          : [s.signoff ? 'the sign-off was for an earlier version of the plan' : 'not signed off']),
      ],
    },
  };
}
