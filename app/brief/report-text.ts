import { terrainReportLines } from './brief-terrain';
import { CAUTION_TEXT } from './caution';
import type { Plan } from '../plan';
import { includedText, type PlanResult, pHitText } from '../planner';

const fix = (v: number | null | undefined, d = 1): string => {
  if (v === null || v === undefined || !Number.isFinite(v)) return '-';
  const s = v.toFixed(d);
  // Values that round to zero print without a sign.
  return Number(s) === 0 ? (0).toFixed(d) : s;
};

function table(rows: string[][]): string {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  return rows
    .map((r) =>
      r
        .map((cell, c) => cell.padEnd(widths[c]))
        .join('  ')
        .trimEnd(),
    )
    .join('\n');
}

/** Plain-text summary of a planned drop for terminals and logs. */
export function formatPlanText(plan: Plan, r: PlanResult): string {
  const moving = r.track.groundSpeed_mps > 0;
  const head = [
    `Seedfall plan: ${r.name}`,
    `Time ${r.time}  release ${plan.release.lat.toFixed(6)}, ${plan.release.lon.toFixed(6)}` +
      `  at ${fix(r.releaseAltitudeMSL_m, 0)} m MSL (${fix(r.releaseAltitudeMSL_m - plan.groundElevation_m, 0)} m above plan ground)`,
    moving
      ? `Carrier ${fix(r.track.groundSpeed_mps)} m/s on track ${fix(r.track.trackDeg, 0)}° true; times are s relative to passing the release point`
      : 'Carrier hovering; zones are where to hold for each site',
    `Declination ${r.declination_deg === null ? 'unavailable' : `${fix(r.declination_deg, 2)}° (${r.declinationModel})`}` +
      `  required P(hit) ${plan.requiredPHit}  samples ${plan.monteCarlo.samples} seed ${plan.monteCarlo.seed}`,
    includedText(r.errorSources),
    ...r.errorSources.map((e) => `  ${e.label}: ${e.detail}`),
    '',
  ];
  const rows = [
    [
      'site',
      'variant',
      'reach',
      'P(hit)',
      'CEP m',
      'fall s',
      moving ? 'window s' : 'zone m',
      'hdg T/M °',
      'thrust s',
      '95% ellipse m',
    ],
  ];
  for (const s of r.sites) {
    // An edge at the search limit is marked: the window or zone reaches at least that far.
    const w = s.releaseWindow;
    const z = s.releaseZone;
    const win = moving
      ? w
        ? `${w.openUnbounded ? '<' : ''}${fix(w.open_s)}..${w.closeUnbounded ? '>' : ''}${fix(w.close_s)}`
        : 'none'
      : z
        ? `r ${z.unbounded ? '>' : ''}${fix(z.radius_m, 0)}`
        : 'none';
    rows.push([
      s.id,
      !s.pinned && s.recommendation?.kind === 'unreachable'
        ? 'no variant can reach this site'
        : `${s.variant}${s.pinned ? ' (pinned)' : ''}${s.meetsRequired ? '' : ' !'}`,
      s.reachable ? 'yes' : 'NO',
      pHitText(s.pHit, s.pHitSE),
      fix(s.cep_m),
      fix(s.fallTime_s),
      win,
      s.headingTrue_deg === undefined
        ? '-'
        : `${fix(s.headingTrue_deg, 0)}/${fix(s.headingMag_deg, 0)}`,
      fix(s.thrustTime_s),
      `${fix(s.ellipse95.semiMajor_m)} x ${fix(s.ellipse95.semiMinor_m)} @ ${fix(s.ellipse95.azimuth_deg, 0)}°`,
    ]);
  }
  // Why each site has its variant, one short line per site (the recommendation's reason).
  const why = [
    '',
    'Why this variant:',
    ...r.sites.map((s) =>
      s.pinned
        ? `  ${s.id}: pinned in the plan; ${s.recommendation?.kind === 'unreachable' ? s.recommendation.why : `the rule would pick ${s.recommended}: ${s.recommendation?.why ?? ''}`}`
        : `  ${s.id}: ${s.recommendation?.why ?? ''}`,
    ),
  ];
  const foot = [
    ...why,
    ...terrainReportLines(r),
    '',
    '! = below the required P(hit)',
    '± = Monte Carlo standard error of P(hit), √(p(1−p)/n) over the samples',
  ];
  const limitHit = r.sites.some(
    (s) =>
      s.releaseWindow?.openUnbounded || s.releaseWindow?.closeUnbounded || s.releaseZone?.unbounded,
  );
  if (limitHit)
    foot.push('< > = the search stopped at its limit; the window or zone reaches farther');
  for (const w of r.warnings) foot.push(`Warning: ${w}`);
  foot.push('', `CAUTION: ${CAUTION_TEXT}`, '');
  return [...head, table(rows), ...foot].join('\n');
}
