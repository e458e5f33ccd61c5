// How honest a P(hit) is, in words shared by the brief, the text report, the map tooltips and the
// results table: the Monte Carlo standard error beside P(hit), the error sources the samples flew,
// and the gust and vertical air of one fall (docs/model.md §8, §8a, §9).
import type { ErrorSource, VariantResult } from '../planner';

const fin = (v: number | null | undefined): v is number =>
  v !== null && v !== undefined && Number.isFinite(v);
const f1 = (v: number): string => (Number(v.toFixed(1)) || 0).toFixed(1);

/**
 * P(hit) (0–1) with its Monte Carlo standard error, both to two decimals: "0.91 ± 0.01". An error
 * that rounds to 0.00 is written "± <0.01", never "± 0.00"; a missing error leaves P(hit) alone.
 */
export function pHitText(pHit: number, se?: number | null): string {
  if (!fin(pHit)) return '–';
  const p = (Number(pHit.toFixed(2)) || 0).toFixed(2);
  if (!fin(se)) return p;
  return se < 0.005 ? `${p} ± <0.01` : `${p} ± ${se.toFixed(2)}`;
}

/** One line naming the error sources P(hit), CEP and the ellipses include. */
export function includedText(sources: readonly ErrorSource[]): string {
  return sources.length === 0
    ? 'Included error sources: none (every flight is the nominal one).'
    : `Included error sources: ${sources.map((e) => e.label).join(', ')}.`;
}

const mps = (v: number): string => `${f1(v)} m/s`;

/**
 * The turbulence one fall flew, e.g. "gust 1σ 0.8 m/s, correlation time 3.1 s · vertical air 1σ
 * 0.4 m/s" ("none" where there is none); `speed` writes m/s in the reader's unit (default m/s).
 */
export function fallTurbulenceText(
  v: Pick<VariantResult, 'gust_mps' | 'gustTime_s' | 'verticalAir_mps'>,
  speed: (mps: number) => string = mps,
): string {
  const gust =
    fin(v.gust_mps) && v.gust_mps > 0
      ? `gust 1σ ${speed(v.gust_mps)}, correlation time ${f1(v.gustTime_s)} s`
      : 'gust none';
  const vert =
    fin(v.verticalAir_mps) && v.verticalAir_mps > 0 ? `1σ ${speed(v.verticalAir_mps)}` : 'none';
  return `${gust} · vertical air ${vert}`;
}
