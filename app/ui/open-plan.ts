/** Opens a plan file the person chose: checked as hostile input, refused with a notice. */
import { MAX_PLAN_BYTES, validatePlan } from '../plan';
import type { PlanStore } from './plan-store';

/**
 * Replaces the plan with the chosen JSON file (one undo step), or leaves the plan as it is and
 * says why in the notice. Files over MAX_PLAN_BYTES are refused unread; a UTF-8 byte-order mark is
 * skipped, as the CLI does.
 */
export async function openPlanFile(s: PlanStore, file: File | undefined): Promise<void> {
  if (!file) return;
  if (file.size > MAX_PLAN_BYTES) {
    const mib = MAX_PLAN_BYTES / 1024 / 1024;
    s.setNotice(
      'error',
      `${file.name} was not opened: it is larger than ${mib} MiB, more than any plan needs. Your plan is unchanged.`,
    );
    return;
  }
  let raw: unknown;
  try {
    raw = JSON.parse((await file.text()).replace(/^\uFEFF/, ''));
  } catch (err) {
    s.setNotice(
      'error',
      `${file.name} was not opened: it is not JSON (${(err as Error).message}). Your plan is unchanged.`,
    );
    return;
  }
  const v = validatePlan(raw);
  if (!v.ok) {
    const first = v.errors
      .slice(0, 4)
      .map((x) => x.message)
      .join('; ');
    const more = v.errors.length > 4 ? ` and ${v.errors.length - 4} more` : '';
    s.setNotice('error', `${file.name} was not opened: ${first}${more}. Your plan is unchanged.`);
    return;
  }
  s.replace(raw as Record<string, unknown>, `Opened ${file.name}.`);
}
