// The brief's "Fall profile over the ground": per site its chosen variant's nominal descent over
// the elevation model, the site's ground and where it came from, the landing ground and any
// ground that hides the site. Printed only when the plan was flown over an elevation model.
import { distance_m } from '../model';
import type { Plan } from '../plan';
import type { PlanResult, SiteResult, VariantResult } from '../planner';
import { esc } from './brief-svg';
import { groundProfileSvg } from './ground-profile-svg';

/** Most sites drawn in the brief (three to a row, about nine to a landscape page). */
export const BRIEF_TERRAIN_MAX_SITES = 60;
/** Most ids listed of the left-out sites with hidden ground. */
const MAX_IDS = 40;

const f = (v: number | null | undefined, d = 0): string =>
  v === null || v === undefined || !Number.isFinite(v)
    ? '—'
    : (Number(v.toFixed(d)) || 0).toFixed(d);

/** The result of the site's chosen variant (the site result itself carries its fields). */
function chosen(s: SiteResult): VariantResult {
  return s.byVariant.find((v) => v.variant === s.variant) ?? s;
}

function hiddenText(v: VariantResult): string {
  const h = v.terrain?.hiddenBy;
  if (!h) return '';
  return `Hidden ground: the descent aimed at this site meets ground ${f(h.aboveSite_m)} m above it, ${f(h.fromSite_m)} m from it (${h.lat.toFixed(5)}, ${h.lon.toFixed(5)}, ${f(h.ground_m)} m MSL) first.`;
}

function siteFigure(s: SiteResult): string {
  const v = chosen(s);
  const t = v.terrain;
  const ground = s.ground;
  const siteElev = ground?.elevation_m;
  const svg = t
    ? groundProfileSvg(t.fallProfile, {
        title: `${s.id} · ${v.variant}`,
        width_px: 400,
        height_px: 210,
        ...(siteElev !== undefined
          ? { site: { dist_m: distance_m(v.release, s), elevation_m: siteElev } }
          : {}),
      })
    : '';
  const source = !ground
    ? 'site elevation: —'
    : ground.source === 'typed'
      ? `site ${f(ground.elevation_m, 1)} m MSL, typed in the plan (model: ${f(ground.terrain_m, 1)} m)`
      : ground.source === 'terrain'
        ? `site ${f(ground.elevation_m, 1)} m MSL, from the elevation model`
        : `site ${f(ground.elevation_m, 1)} m MSL, the plan's ground (the model has no height at the site)`;
  const landing = t ? t.landingGround_m : v.landingGround_m;
  const lines = [
    `${esc(source)}; ground at the uncontrolled landing ${landing === null || landing === undefined ? 'unknown (no model height there)' : `${f(landing, 1)} m MSL`}.`,
  ];
  if (t && t.offTerrain > 0) {
    lines.push(
      `<span class="warnc">${esc(`${f(100 * t.offTerrain, 1)} % of the descents met no known ground (counted as misses).`)}</span>`,
    );
  }
  const hidden = hiddenText(v);
  if (hidden) lines.push(`<span class="bad">${esc(hidden)}</span>`);
  return `<div class="tprof" data-site="${esc(s.id)}"><div class="figure">${svg || `<p>${esc(s.id)}: no profile.</p>`}</div>
<p class="small">${lines.join('<br>')}</p></div>`;
}

/** The terrain section, or '' when the result was not planned over an elevation model. */
export function terrainSection(
  plan: Plan,
  result: PlanResult,
  opts: { note?: string; order?: SiteResult[]; maxSites?: number } = {},
): string {
  const model = result.terrain;
  if (!model) return '';
  const max = Math.max(0, Math.floor(opts.maxSites ?? BRIEF_TERRAIN_MAX_SITES));
  const sites = opts.order ?? result.sites;
  const shown = sites.slice(0, max);
  const left = sites.slice(max);
  const leftHidden = left.filter((s) => chosen(s).terrain?.hiddenBy).map((s) => s.id);
  const carrier =
    model.carrierGroundMin_m === null
      ? ''
      : ` Ground under the carrier: ${f(model.carrierGroundMin_m)} to ${f(model.carrierGroundMax_m)} m MSL.`;
  const leftText = left.length
    ? `<p class="small" data-testid="terrain-left-out">${left.length} more site(s) left out of this section (only the first ${max} are drawn).${
        leftHidden.length
          ? ` <span class="bad">Hidden ground at ${leftHidden.length} of them: ${esc(leftHidden.slice(0, MAX_IDS).join(', '))}${leftHidden.length > MAX_IDS ? ', …' : ''}.</span>`
          : ''
      }</p>`
    : '';
  return `<section class="terrain"><div class="keep"><h2>Fall profile over the ground</h2>
<p>Elevation model: <b>${esc(model.name)}</b>${opts.note ? ` (${esc(opts.note)})` : ''}. Each descent ends where it meets this ground; wind layers given AGL stay referred to the plan ground (${f(plan.groundElevation_m)} m MSL).${esc(carrier)}</p>
<p class="small">Each drawing: the nominal descent of the site’s variant aimed at the site, from the release (left) to the ground, altitude MSL against distance from the release, to where it meets the ground; the ground under it filled (gaps: no height in the model); the site ▼ and its level (dashed). The uncontrolled landing is where the vehicle lands unsteered (JSON landingGround_m).</p></div>
<div class="tgrid">${shown.map(siteFigure).join('\n')}</div>
${leftText}
</section>`;
}

/** Lines of the text report on the ground (none when not planned over an elevation model). */
export function terrainReportLines(result: PlanResult): string[] {
  const model = result.terrain;
  if (!model) return [];
  const rows = [
    ['site', 'variant', 'site ground m', 'from', 'uncontrolled landing ground m', 'off model'],
  ];
  const notes: string[] = [];
  for (const s of result.sites) {
    const v = chosen(s);
    const t = v.terrain;
    const landing = t ? t.landingGround_m : v.landingGround_m;
    rows.push([
      s.id,
      v.variant,
      f(s.ground?.elevation_m, 1),
      !s.ground
        ? '-'
        : s.ground.source === 'typed'
          ? `typed (model ${f(s.ground.terrain_m, 1)})`
          : s.ground.source === 'terrain'
            ? 'terrain'
            : 'plan ground (no model height)',
      landing === null || landing === undefined ? 'unknown' : f(landing, 1),
      t ? `${f(100 * t.offTerrain, 1)} %` : '-',
    ]);
    const hidden = hiddenText(v);
    if (hidden) notes.push(`  ${s.id}: ${hidden}`);
  }
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  const table = rows.map((r) =>
    r
      .map((cell, c) => cell.padEnd(widths[c]))
      .join('  ')
      .trimEnd(),
  );
  const carrier =
    model.carrierGroundMin_m === null
      ? ''
      : `; ground under the carrier ${f(model.carrierGroundMin_m)} to ${f(model.carrierGroundMax_m)} m MSL`;
  return [
    '',
    `Terrain: ${model.name}${carrier}`,
    ...table,
    ...(notes.length ? ['Hidden ground:', ...notes] : []),
  ];
}
