/**
 * The safety state of a plan: its settings (plan values over the defaults), the automatic checks,
 * the crew checklist and the sign-off, put together the same way for the app, the brief and the
 * CLI.
 */
import { type Plan, planFingerprint, type Signoff } from '../plan';
import type { PlanResult } from '../planner';
import {
  DEFAULT_MANUAL_ITEMS,
  doneWithoutName,
  readiness,
  type ManualItem,
  type Readiness,
} from './readiness';
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
    terrainClearance_m: s.terrainClearance_m ?? DEFAULT_SAFETY_SETTINGS.terrainClearance_m,
    noDropZones: (s.noDropZones ?? []).map((z) => ({
      type: 'Feature' as const,
      properties: { name: z.properties?.name ?? '' },
      geometry: z.geometry,
    })),
  };
}

/** The crew checklist of a plan (the template when the plan has none yet). */
export function checklistOf(plan: Plan): ManualItem[] {
  return (plan.safety?.checklist ?? DEFAULT_MANUAL_ITEMS).map((m) => ({ ...m }));
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
export function blockingText(s: PlanSafety, only?: 'check' | 'item'): string[] {
  const blocking = only
    ? s.readiness.blocking.filter((b) => b.startsWith(`${only}:`))
    : s.readiness.blocking;
  return blocking.map((b) => {
    const [kind, id] = b.split(':');
    if (kind === 'check') return `failing check: ${s.checks.find((c) => c.id === id)?.title ?? id}`;
    const m = s.checklist.find((x) => x.id === id);
    if (m && doneWithoutName(m)) return `crew item marked done with nobody named: ${m.text}`;
    return `open crew item: ${m?.text ?? id}`;
  });
}
