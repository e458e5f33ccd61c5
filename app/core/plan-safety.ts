/**
 * The safety state of a plan: its settings (plan values over the defaults), the automatic checks,
 * the crew checklist and the sign-off, put together the same way for the app, the brief and the
 * CLI.
 */
import type { BriefSafety } from './brief-html';
import type { Plan, Signoff } from './plan';
import type { PlanResult } from './planner';
import { DEFAULT_MANUAL_ITEMS, readiness, type ManualItem, type Readiness } from './readiness';
import {
  DEFAULT_SAFETY_SETTINGS,
  safetyChecks,
  type SafetyReport,
  type SafetySettings,
} from './safety';

/** Safety settings of a plan: its own values over DEFAULT_SAFETY_SETTINGS. */
export function safetySettingsOf(plan: Plan): SafetySettings {
  const s = plan.safety ?? {};
  return {
    ceiling_m: s.ceiling_m ?? DEFAULT_SAFETY_SETTINGS.ceiling_m,
    noDropBuffer_m: s.noDropBuffer_m ?? DEFAULT_SAFETY_SETTINGS.noDropBuffer_m,
    hazardBuffer_m: s.hazardBuffer_m ?? DEFAULT_SAFETY_SETTINGS.hazardBuffer_m,
    thrustMargin_pct: s.thrustMargin_pct ?? DEFAULT_SAFETY_SETTINGS.thrustMargin_pct,
    noDropZones: (s.noDropZones ?? []).map((z) => ({
      type: 'Feature' as const,
      properties: { name: z.properties?.name ?? '' },
      geometry: z.geometry,
    })),
  };
}

/** The crew checklist of a plan (the template when the plan has none yet). */
export function checklistOf(plan: Plan): ManualItem[] {
  return (
    plan.safety?.checklist?.map((m) => ({ ...m })) ?? DEFAULT_MANUAL_ITEMS.map((m) => ({ ...m }))
  );
}

/** Everything the safety panel and the brief show. */
export interface PlanSafety extends SafetyReport {
  settings: SafetySettings;
  checklist: ManualItem[];
  /** Readiness now; failing checks the sign-off's reason covers count as overridden. */
  readiness: Readiness;
  signoff: Signoff | null;
  /** The sign-off was made for exactly this plan (same fingerprint). */
  signoffCurrent: boolean;
  /** Ready and signed off for this plan. */
  signedReady: boolean;
}

/**
 * Fingerprint of a plan without its sign-off (FNV-1a, 32 bit, hex): any edit after signing — a
 * site, a wind, a checklist tick — changes it and so voids the sign-off.
 */
export function planFingerprint(plan: Plan): string {
  const copy: Plan = {
    ...plan,
    safety: plan.safety ? { ...plan.safety, signoff: undefined } : undefined,
  };
  const text = JSON.stringify(copy);
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, '0');
}

/** Runs the automatic checks and combines them with the checklist and sign-off. */
export function planSafety(plan: Plan, result: PlanResult): PlanSafety {
  const settings = safetySettingsOf(plan);
  const report = safetyChecks(plan, result, settings);
  const checklist = checklistOf(plan);
  const signoff = plan.safety?.signoff ?? null;
  const signoffCurrent = signoff !== null && signoff.planHash === planFingerprint(plan);
  // The reason overrides only the checks that were failing when it was written.
  const covers = new Set(signoffCurrent && signoff?.reason?.trim() ? (signoff.covers ?? []) : []);
  const failing = report.checks.filter((c) => c.status === 'fail');
  const uncovered = failing.filter((c) => !covers.has(c.id));
  const override =
    failing.length > 0 && uncovered.length === 0 && signoff?.reason
      ? { reason: signoff.reason, who: signoff.who, when: signoff.when }
      : undefined;
  const r = readiness(report.checks, checklist, override);
  return {
    ...report,
    settings,
    checklist,
    readiness: r,
    signoff,
    signoffCurrent,
    signedReady: r.ready && signoffCurrent,
  };
}

/** `check:<id>` / `manual:<id>` blockers in words. */
export function blockingText(s: PlanSafety): string[] {
  return s.readiness.blocking.map((b) => {
    const [kind, id] = b.split(':');
    if (kind === 'check') return `failing check: ${s.checks.find((c) => c.id === id)?.title ?? id}`;
    return `open crew item: ${s.checklist.find((m) => m.id === id)?.text ?? id}`;
  });
}

/** The safety part of the printed brief. */
export function briefSafety(s: PlanSafety): BriefSafety {
  const geom = s.hazardArea.geometry;
  const polys = geom.type === 'Polygon' ? [geom.coordinates] : geom.coordinates;
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
        ...blockingText(s).filter((b) => b.startsWith('failing')),
        ...(s.checklist.some((m) => m.state === 'open')
          ? [`${s.checklist.filter((m) => m.state === 'open').length} crew item(s) open`]
          : []),
        ...(s.signoffCurrent
          ? []
          : [s.signoff ? 'the sign-off was for an earlier version of the plan' : 'not signed off']),
      ],
    },
  };
}
