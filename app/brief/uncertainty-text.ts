// The gust and vertical air of one fall in words, for the brief and the map tooltips
// (docs/model.md §8a). P(hit) ± its error and the included sources: app/planner/error-sources.ts.
import type { VariantResult } from '../planner';

const fin = (v: number | null | undefined): v is number =>
  v !== null && v !== undefined && Number.isFinite(v);
const f1 = (v: number): string => (Number(v.toFixed(1)) || 0).toFixed(1);

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
