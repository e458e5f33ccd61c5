// Puts imported wind layers (and temperatures) into the plan and says what went in.
import type { WindLayer } from '../model';
import type { PlanStore } from './plan-store';

/**
 * Puts layers (and optionally temperatures) into the plan as one undo step. The notice says
 * "in use" only for what went in, and counts what the import left out (`notUsed`).
 */
export function applyWindLayers(
  s: PlanStore,
  reference: 'AGL' | 'MSL',
  layers: WindLayer[],
  temperatures: { altitude_m: number; temperature_K: number }[],
  what: string,
  notUsed = 0,
): void {
  const winds = s.obj('winds');
  const atmosphere = s.obj('atmosphere');
  const next = structuredClone(s.draft);
  next.winds = { ...winds, reference, layers };
  if (temperatures.length) {
    next.atmosphere = { ...atmosphere, sounding: { reference, levels: temperatures } };
  }
  const keptSounding = !temperatures.length && (atmosphere as { sounding?: unknown }).sounding;
  s.replace(next);
  s.setNotice(
    notUsed > 0 ? 'error' : 'info',
    `${what}: ${layers.length} wind layer(s)${temperatures.length ? ` and ${temperatures.length} temperature(s)` : ''} in use.` +
      (notUsed > 0
        ? ` ${notUsed} value(s) were not used: outside the plan's ranges or over its limits (listed under Problems).`
        : '') +
      (keptSounding
        ? ' The earlier sounding’s temperatures still set the air density (remove them with “Use the ISA offset instead”).'
        : ''),
  );
}
