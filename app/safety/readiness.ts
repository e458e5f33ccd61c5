/**
 * Readiness for release: no failing automatic check (or a recorded override) and every item of
 * the crew's manual checklist done, with who did it, or marked not applicable. Warnings never block.
 */
import type { ChecklistItem } from '../plan';
import type { CheckResult } from './safety';

/** One manual checklist item, ticked by a person (the plan file's `safety.checklist` item). */
export type ManualItem = ChecklistItem;

/** A decision to go ahead despite failing automatic checks; the reason must be written down. */
export interface ReadinessOverride {
  reason: string;
  who: string;
  /** ISO 8601. */
  when: string;
}

export interface Readiness {
  ready: boolean;
  /** What stands in the way now: `check:<id>` for failing checks, `manual:<id>` for open items. */
  blocking: string[];
  /** True when failing checks were set aside by a valid override. */
  overridden: boolean;
}

const item = (id: string, text: string): Readonly<ManualItem> =>
  Object.freeze({ id, text, state: 'open' as const });

/** The checklist a new plan starts with (common practice before releasing anything from the air). */
export const DEFAULT_MANUAL_ITEMS: readonly Readonly<ManualItem>[] = Object.freeze([
  item('airspace', 'Airspace authorisation for this flight is in hand.'),
  item('landowner', 'The landowner has agreed to the drops.'),
  item('briefing', 'The crew has been shown the hazard area.'),
  item('area-clear', 'Nobody is inside the hazard area.'),
  item('compass', 'Vehicle compasses have been calibrated on site.'),
  item('vehicles', 'Vehicles are charged and armed.'),
  item('release', 'The release mechanism has been tried on the ground.'),
  item('comms', 'Radio or phone contact between crew members works.'),
]);

/**
 * An item marked done with nobody named: it counts as open (a tick must say who checked), and the
 * app shows the problem beside the item rather than filling in a name.
 */
export function doneWithoutName(m: Readonly<Partial<ManualItem>>): boolean {
  return m.state === 'done' && !(typeof m.who === 'string' && m.who.trim());
}

/** The item still stands in the way: open, or done with nobody named. */
export function itemOpen(m: Readonly<Partial<ManualItem>>): boolean {
  return m.state === 'open' || doneWithoutName(m);
}

/**
 * Ready when no automatic check fails and every manual item is done (with a name) or n/a.
 * Failing checks may be set aside only by an override with a non-empty reason; open manual items
 * never can.
 */
export function readiness(
  checks: readonly CheckResult[],
  manual: readonly ManualItem[],
  override?: ReadinessOverride,
): Readiness {
  const failing = checks.filter((c) => c.status === 'fail').map((c) => `check:${c.id}`);
  const open = manual.filter(itemOpen).map((m) => `manual:${m.id}`);
  const valid = override !== undefined && override.reason.trim().length > 0;
  const overridden = valid && failing.length > 0;
  const blocking = [...(overridden ? [] : failing), ...open];
  return { ready: blocking.length === 0, blocking, overridden };
}

/** Ready only if no automatic check fails and every manual item is done (named) or n/a (no override). */
export function overallReady(
  checks: readonly CheckResult[],
  manual: readonly ManualItem[],
): boolean {
  return readiness(checks, manual).ready;
}
