// The brief's touchdown table: every variant's mass, touchdown speed and impact energy (J and
// ft-lbf) where it lands fastest among the plan's sites, with the local-rules caution.
import { esc } from './brief-svg';
import type { Plan } from '../plan';
import type { PlanResult } from '../planner';
import {
  IMPACT_CAT2_FT_LBF,
  IMPACT_CAT3_FT_LBF,
  J_PER_FT_LBF,
  siteTouchdowns,
  type Touchdown,
} from '../safety';

const f = (v: number, d: number): string => (Number(v.toFixed(d)) || 0).toFixed(d);

/** Per variant (catalogue order) its touchdown at the highest site: the thinnest air, the fastest descent. */
export function variantTouchdowns(
  plan: Plan,
  result: PlanResult,
): { site: string | null; elevation_m: number; rows: Touchdown[] } {
  let site: string | null = null;
  let elev = -Infinity;
  for (const s of plan.sites) {
    if (s.elevation_m > elev) {
      elev = s.elevation_m;
      site = s.id;
    }
  }
  if (site === null) return { site, elevation_m: plan.groundElevation_m, rows: [] };
  return { site, elevation_m: elev, rows: siteTouchdowns(plan, result, site) };
}

/** The impact energy section of the brief. */
export function energySection(plan: Plan, result: PlanResult): string {
  const { site, elevation_m, rows } = variantTouchdowns(plan, result);
  if (rows.length === 0) return '';
  const used = new Map<string, number>();
  for (const s of result.sites) used.set(s.variant, (used.get(s.variant) ?? 0) + 1);
  const cat2 = IMPACT_CAT2_FT_LBF * J_PER_FT_LBF;
  const cat3 = IMPACT_CAT3_FT_LBF * J_PER_FT_LBF;
  const body = rows
    .map((t) => {
      const e = t.energy_J;
      const over = e === null ? '' : e > cat3 ? ' bad' : e > cat2 ? ' warnc' : '';
      return `<tr data-variant="${esc(t.variant)}"><td>${esc(t.variant)}</td><td class="num">${used.get(t.variant) ?? 0}</td>
<td class="num">${t.mass_kg === null ? 'unknown' : f(t.mass_kg, 3)}</td><td class="num">${f(t.vertical_mps, 1)}</td><td class="num">${f(t.horizontal_mps, 1)}</td>
<td class="num">${f(t.speed_mps, 1)}</td><td class="num${over}">${e === null ? '—' : f(e, 1)}</td><td class="num${over}">${e === null ? '—' : f(e / J_PER_FT_LBF, 1)}</td></tr>`;
    })
    .join('');
  return `<section class="energy"><h2>Touchdown and impact energy per variant</h2>
<table class="energytab"><thead><tr><th>Variant</th><th>Sites</th><th>Mass kg</th><th>Descent m/s</th><th>Across m/s</th><th>Touchdown m/s</th><th>Energy J</th><th>Energy ft-lbf</th></tr></thead><tbody>${body}</tbody></table>
<p class="small">At the highest site (${esc(site)}, ${f(elevation_m, 0)} m): thinnest air, fastest descent. Across: the surface wind, plus the glide of a steered variant still flying. Energy ½·m·v²; “—”: no mass entered (payloadMass_kg). For orientation: 14 CFR 107 subpart D (US) allows ${IMPACT_CAT2_FT_LBF} ft-lbf (${f(cat2, 1)} J) for Category 2 and ${IMPACT_CAT3_FT_LBF} ft-lbf (${f(cat3, 1)} J) for Category 3 operations over people. Local rules govern: the figures are shown for orientation and may not apply where you fly.</p></section>`;
}
