/**
 * Clock times in the plan's own time zone — the UTC offset written in `plan.time` (RFC 3339) —
 * with UTC beside them, for the release-time timeline in the app, the brief and the CLI.
 */

/** A fixed UTC offset read from a plan time. */
export interface PlanZone {
  /** Minutes east of UTC (+01:00 → 60, −05:30 → −330). */
  offset_min: number;
  /** "UTC+01:00", "UTC-05:30" (sign and digits as in the plan), or "UTC". */
  label: string;
}

export const UTC_ZONE: PlanZone = { offset_min: 0, label: 'UTC' };

// RFC 3339 §5.6 time-offset, also the forms ISO 8601 allows and the plan schema accepts
// (+01, +0100, +01:00, Z, lower-case z). "-00:00" means "local offset unknown" (RFC 3339 §4.3): UTC.
const OFFSET = /[Tt ]\d\d:\d\d(?::\d\d(?:\.\d+)?)?(?:[Zz]|([+-])(\d\d)(?::?(\d\d))?)$/;

/** The zone written in a plan time (ISO 8601 with offset); UTC when there is none or it is unreadable. */
export function planZone(planTime: string): PlanZone {
  const m = OFFSET.exec(typeof planTime === 'string' ? planTime : '');
  if (!m || m[1] === undefined) return UTC_ZONE;
  const h = Number(m[2]);
  const min = Number(m[3] ?? '0');
  if (h > 23 || min > 59 || (h === 0 && min === 0)) return UTC_ZONE;
  const sign = m[1] === '-' ? -1 : 1;
  const hhmm = `${m[2]}:${m[3] ?? '00'}`;
  return { offset_min: sign * (h * 60 + min), label: `UTC${m[1]}${hhmm}` };
}

/** Whether a zone is UTC itself (then one clock time says it all). */
export const isUtc = (zone: PlanZone): boolean => zone.offset_min === 0;

/** Date and clock time in `zone` of an instant (ms since the epoch): "2026-12-01", "10:15" (":30" seconds when not 0). */
export function zoneClock(ms: number, zone: PlanZone): { date: string; time: string } {
  if (!Number.isFinite(ms)) return { date: '—', time: '—' };
  const iso = new Date(ms + zone.offset_min * 60_000).toISOString();
  const secs = iso.slice(17, 19);
  return { date: iso.slice(0, 10), time: secs === '00' ? iso.slice(11, 16) : iso.slice(11, 19) };
}

/**
 * "10:15 UTC+01:00 (09:15 UTC)", or "09:15 UTC" in UTC; with the date in front of each clock time
 * when `withDate` (for spans over more than one day).
 */
export function zoneClockText(ms: number, zone: PlanZone, withDate = false): string {
  const one = (z: PlanZone): string => {
    const c = zoneClock(ms, z);
    return `${withDate ? `${c.date} ` : ''}${c.time} ${z.label}`;
  };
  return isUtc(zone) ? one(UTC_ZONE) : `${one(zone)} (${one(UTC_ZONE)})`;
}
