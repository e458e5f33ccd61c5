/** Opens a plan file the person chose: checked as hostile input, refused with a notice. */
import { validatePlan } from '../plan';
import type { PlanStore } from './plan-store';

/**
 * Replaces the plan with the JSON file chosen in input (one undo step), or leaves the plan as it
 * is and says why in the notice. The input is cleared so the same file can be chosen again.
 */
export async function openPlanFile(s: PlanStore, input: HTMLInputElement): Promise<void> {
  const file = input.files?.[0];
  input.value = '';
  if (!file) return;
  let raw: unknown;
  try {
    raw = JSON.parse(await file.text());
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
