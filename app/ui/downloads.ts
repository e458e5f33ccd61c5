/** Files the app hands to the browser: the plan, exports of a result, a damaged draft. */
import { toGeoJSON, toGPX, toKML, toScheduleCSV, toSitesCSV } from '../formats';
import type { Plan } from '../plan';
import type { PlanResult } from '../planner';
import type { PlanStore } from './plan-store';

/** The exchange formats a result can be exported as. */
export type ExportKind = 'geojson' | 'kml' | 'gpx' | 'csv' | 'sites';

/** A file name from a plan name: letters, digits, dots and dashes only. */
export function fileBase(name: unknown): string {
  return (
    String(name ?? 'plan')
      .replace(/[^\w.-]+/g, '-')
      .replace(/^-+|-+$/g, '') || 'plan'
  );
}

/** Hands text to the browser as a file download. */
export function download(text: string, type: string, name: string): void {
  const a = document.createElement('a');
  a.href = URL.createObjectURL(new Blob([text], { type }));
  a.download = name;
  a.click();
  setTimeout(() => URL.revokeObjectURL(a.href), 1000);
}

/** Downloads the plan being edited (valid or not) as JSON. */
export function savePlan(s: PlanStore): void {
  const name = `${fileBase(s.get('name'))}.json`;
  download(`${JSON.stringify(s.draft, null, 2)}\n`, 'application/json', name);
  s.setNotice(
    s.valid ? 'info' : 'error',
    s.valid
      ? `Saved ${name}.`
      : `Saved ${name} — it still has problems to fix before it can be planned.`,
  );
}

/**
 * The plan and the result computed from it, for the brief and exports; null (with a notice)
 * while planning is still running, so a file never mixes an edited plan with an older result.
 */
export function computedPair(
  s: PlanStore,
  what: string,
): { plan: Plan; result: PlanResult } | null {
  if (s.computing) {
    s.setNotice(
      'error',
      `Planning is still running for your latest edits; the ${what} waits for it — try again in a moment.`,
    );
    return null;
  }
  if (!s.resultPlan || !s.result) {
    s.setNotice('error', `No planning result yet: the ${what} needs a valid plan.`);
    return null;
  }
  if (s.resultPlan !== s.plan || !s.valid) {
    s.setNotice('error', `The plan has problems to fix; the ${what} shows the last valid plan.`);
  }
  return { plan: s.resultPlan, result: s.result };
}

/**
 * Downloads one of the exchange formats of the current result; bom starts CSV files with a
 * UTF-8 byte-order mark (spreadsheets then read accents right).
 */
export function exportAs(s: PlanStore, kind: ExportKind, bom: boolean): void {
  const pair = computedPair(s, 'export');
  if (!pair) return;
  const { plan, result } = pair;
  const base = fileBase(plan.name);
  const hazard = s.safety?.hazardArea;
  const out: Record<ExportKind, [string, string, string]> = {
    geojson: [
      JSON.stringify(toGeoJSON(plan, result, hazard ? { hazardArea: hazard } : {}), null, 1),
      'application/geo+json',
      `${base}.geojson`,
    ],
    kml: [
      toKML(plan, result, hazard ? { hazardArea: hazard } : {}),
      'application/vnd.google-earth.kml+xml',
      `${base}.kml`,
    ],
    gpx: [toGPX(plan, result), 'application/gpx+xml', `${base}.gpx`],
    csv: [toScheduleCSV(plan, result, { bom }), 'text/csv', `${base}-schedule.csv`],
    sites: [toSitesCSV(plan, { bom }), 'text/csv', `${base}-sites.csv`],
  };
  const [text, type, name] = out[kind];
  download(text, type, name);
  s.setNotice('info', `Exported ${name}.`);
}

/** Downloads a damaged saved draft exactly as it was stored. */
export function downloadDamaged(s: PlanStore): void {
  const d = s.damaged;
  if (!d) return;
  const stamp = (d.at || new Date().toISOString()).replace(/[^\dT]/g, '').slice(0, 15);
  download(d.text, 'text/plain', `seedfall-damaged-draft-${stamp}.txt`);
}
