/** Opens a plan file the person chose: checked as hostile input, refused with a notice. */
import { MAX_PLAN_BYTES, validatePlan } from '../plan';
import type { PlanStore } from './plan-store';

/**
 * A plan file checked as hostile input: its JSON when it validates, or why not (naming the file's
 * problems). Files over MAX_PLAN_BYTES are refused unread; a UTF-8 byte-order mark is skipped, as
 * the CLI does. Open and the plan library's Import both use it.
 */
export async function readPlanFile(
  file: File,
): Promise<{ ok: true; raw: Record<string, unknown> } | { ok: false; why: string }> {
  if (file.size > MAX_PLAN_BYTES) {
    const mib = MAX_PLAN_BYTES / 1024 / 1024;
    return { ok: false, why: `it is larger than ${mib} MiB, more than any plan needs.` };
  }
  let raw: unknown;
  try {
    raw = JSON.parse((await file.text()).replace(/^\uFEFF/, ''));
  } catch (err) {
    return { ok: false, why: `it is not JSON (${(err as Error).message}).` };
  }
  const v = validatePlan(raw);
  if (!v.ok) {
    const first = v.errors
      .slice(0, 4)
      .map((x) => x.message)
      .join('; ');
    const more = v.errors.length > 4 ? ` and ${v.errors.length - 4} more` : '';
    return { ok: false, why: `${first}${more}.` };
  }
  return { ok: true, raw: raw as Record<string, unknown> };
}

/** Replaces the plan with the chosen JSON file (one undo step), or leaves it and says why. */
export async function openPlanFile(s: PlanStore, file: File | undefined): Promise<void> {
  if (!file) return;
  const r = await readPlanFile(file);
  if (!r.ok) {
    s.setNotice('error', `${file.name} was not opened: ${r.why} Your plan is unchanged.`);
    return;
  }
  s.replace(r.raw, `Opened ${file.name}.`);
}
