// Which error sources a plan's P(hit), CEP and ellipses include, in words for the table, the map
// tooltips and the brief (docs/model.md §8, §8a).
import { CLASS_W20_MPS, W20_HEIGHT_M } from '../model';
import { type Plan, planWindProfile } from '../plan';

/** One error source the Monte Carlo flies. */
export interface ErrorSource {
  id:
    | 'wind'
    | 'gust'
    | 'verticalAir'
    | 'descentRate'
    | 'releasePosition'
    | 'releaseTiming'
    | 'heading';
  /** Short name, e.g. "gusts". */
  label: string;
  /** Size and origin in plain words, e.g. "0.5 m/s per component, modelled (auto)". */
  detail: string;
}

const f1 = (x: number): string => (Math.round(x * 10) / 10).toString();

/** Wind speed (m/s) at 20 ft above the plan ground, which `auto` turbulence reads. */
function autoW20(plan: Plan): number {
  const w = planWindProfile(plan).at(plan.groundElevation_m + W20_HEIGHT_M);
  return Math.hypot(w.east_mps, w.north_mps);
}

/** The plan's modelled turbulence in words: class and the wind at 20 ft that sets it. */
export function turbulenceText(plan: Plan): string {
  const t = plan.uncertainty.turbulence;
  if (t === 'none') return 'no modelled turbulence';
  if (t !== 'auto') return `${t} turbulence (wind at 20 ft ${f1(CLASS_W20_MPS[t])} m/s)`;
  return `turbulence from the plan's wind at 20 ft (${f1(autoW20(plan))} m/s at the plan ground)`;
}

/**
 * The error sources a plan includes (σ above zero), in the order of docs/model.md §8. The
 * modelled gust and vertical air are listed when the class models them or a value is set;
 * a set value is named as set.
 */
export function errorSources(plan: Plan): ErrorSource[] {
  const u = plan.uncertainty;
  const out: ErrorSource[] = [];
  // `auto` in calm air at 20 ft models nothing: no gust, no vertical air.
  const modelled = u.turbulence === 'auto' ? autoW20(plan) > 0 : u.turbulence !== 'none';
  if (u.windSpeed_mps > 0) {
    out.push({
      id: 'wind',
      label: 'forecast wind error',
      detail: `${f1(u.windSpeed_mps)} m/s per component, correlated over ${f1(u.windCorrelation_m)} m`,
    });
  }
  const gustSet = u.gust_mps !== undefined;
  if (gustSet ? u.gust_mps! > 0 : modelled) {
    const size = gustSet
      ? `${f1(u.gust_mps!)} m/s per component (set)`
      : `modelled: ${turbulenceText(plan)}`;
    const time =
      u.gustTime_s !== undefined
        ? `correlation time ${f1(u.gustTime_s)} s (set)`
        : 'correlation time from the length scale and the descent speed';
    out.push({ id: 'gust', label: 'gusts', detail: `${size}; ${time}` });
  }
  const vertSet = u.verticalAir_mps !== undefined;
  if (vertSet ? u.verticalAir_mps! > 0 : modelled) {
    out.push({
      id: 'verticalAir',
      label: 'vertical air',
      detail: vertSet
        ? `${f1(u.verticalAir_mps!)} m/s, constant through each fall (set)`
        : `modelled: ${turbulenceText(plan)}`,
    });
  }
  if (u.descentRate_pct > 0) {
    out.push({ id: 'descentRate', label: 'descent rate', detail: `${f1(u.descentRate_pct)} %` });
  }
  if (u.releasePosition_m > 0) {
    out.push({
      id: 'releasePosition',
      label: 'release position',
      detail: `${f1(u.releasePosition_m)} m per axis`,
    });
  }
  if (u.releaseTiming_s > 0 && plan.carrier.groundSpeed_mps > 0) {
    out.push({
      id: 'releaseTiming',
      label: 'release timing',
      detail: `${f1(u.releaseTiming_s)} s`,
    });
  }
  if (u.heading_deg > 0 && plan.variants.some((v) => v.guidance !== 'passive')) {
    out.push({ id: 'heading', label: 'heading (steered)', detail: `${f1(u.heading_deg)}°` });
  }
  return out;
}

/** One line naming the error sources P(hit), CEP and the ellipses include. */
export function includedText(sources: readonly ErrorSource[]): string {
  return sources.length === 0
    ? 'Included error sources: none (every flight is the nominal one).'
    : `Included error sources: ${sources.map((e) => e.label).join(', ')}.`;
}

/**
 * P(hit) (0–1) and its Monte Carlo standard error as text, both to two decimals: p "0.91", se
 * "0.01". An error that rounds to 0.00 is written "<0.01", never "0.00"; a missing error is null.
 * For views that set the two apart (a smaller type for the error); pHitText joins them.
 */
export function pHitParts(pHit: number, se?: number | null): { p: string; se: string | null } {
  if (!Number.isFinite(pHit)) return { p: '–', se: null };
  const p = (Number(pHit.toFixed(2)) || 0).toFixed(2);
  if (se === null || se === undefined || !Number.isFinite(se)) return { p, se: null };
  return { p, se: se < 0.005 ? '<0.01' : se.toFixed(2) };
}

/** P(hit) with its Monte Carlo standard error: "0.91 ± 0.01" (see pHitParts). */
export function pHitText(pHit: number, se?: number | null): string {
  const t = pHitParts(pHit, se);
  return t.se === null ? t.p : `${t.p} ± ${t.se}`;
}
