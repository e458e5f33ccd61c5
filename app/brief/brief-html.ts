/**
 * The drop brief for the field crew as one self-contained HTML document (string; no DOM), so the
 * app's print view and the CLI produce the same pages. All plan text is escaped.
 */
import {
  airAt,
  formatDMS,
  formatUTM,
  M_PER_FT,
  MPS_PER_KT,
  SoundingAtmosphere,
  toMGRS,
  WMM_VALIDITY,
} from '../model';
import { esc, overviewSvg, PRINT_COLOURS, windPlotSvg } from './brief-svg';
import { CAUTION_TEXT } from './caution';
import { hazardSection, zonesSection } from './brief-areas';
import { energySection } from './brief-energy';
import { terrainSection } from './brief-terrain';
import { timelineSection } from './timeline-section';
import { hodographSvg, sweepSvg } from './wind-plots';
import {
  includedText,
  type PlanResult,
  pHitParts,
  type SiteResult,
  type SweepPoint,
  type TimelineEntry,
} from '../planner';
import type { Plan } from '../plan';

/** A no-drop zone as the brief lists and draws it. */
export interface BriefZone {
  name: string;
  /** Corners of its outer ring(s); holes counted apart. */
  corners: number;
  holes: number;
  /** Outer rings as [lat, lon] pairs. */
  rings: [number, number][][];
  /** The site whose 99 % landing ellipse comes nearest, and how near (m, 0 = overlapping). */
  nearest?: { site: string; clearance_m: number };
}

/** Safety state to print (from the checklist panel and the automatic checks). */
export interface BriefSafety {
  checks: { id?: string; title: string; status: string; why: string; sites?: string[] }[];
  hazardRings?: [number, number][][];
  hazardArea_m2?: number;
  hazardBuffer_m?: number;
  noDropBuffer_m?: number;
  zones?: BriefZone[];
  manual?: { text: string; state: string; who?: string; when?: string; note?: string }[];
  readiness?: {
    ready: boolean;
    overridden?: boolean;
    reason?: string;
    who?: string;
    when?: string;
    blocking?: string[];
  };
}

export interface BriefOptions {
  paper?: 'A4' | 'Letter';
  safety?: BriefSafety;
  /** When the brief was made (default now). */
  generatedAt?: Date;
  /** Adds a screen-only bar with a Print button (the app's print view). */
  printBar?: boolean;
  /** P(hit) and CEP against release altitude for one site and variant (wind-plots.altitudeSweep). */
  sweep?: { title: string; points: SweepPoint[] };
  /** P(hit) per site over the forecast span (planner.planTimeline); prints the timeline section. */
  timeline?: TimelineEntry[];
  /** Why the plan's forecasts have no timeline in this brief (printed instead of it). */
  timelineOmitted?: string;
  /** How the elevation model was read (window, bytes), printed beside its name. */
  terrainNote?: string;
}

const f = (v: number | null | undefined, d = 1): string =>
  v === null || v === undefined || !Number.isFinite(v)
    ? '—'
    : (Number(v.toFixed(d)) || 0).toFixed(d);
/** Signed seconds with one decimal; a value that rounds to zero has no sign. */
const signed = (v: number): string => {
  const r = Number(f(v));
  return `${r > 0 ? '+' : r < 0 ? '−' : ''}${f(Math.abs(r))}`;
};

function mgrsOf(p: { lat: number; lon: number }): string {
  try {
    const m = toMGRS(p, 5);
    return m.replace(/^(\d+[A-Z])([A-Z]{2})(\d{5})(\d{5})$/, '$1 $2 $3 $4');
  } catch {
    return '—';
  }
}

function utmOf(p: { lat: number; lon: number }): string {
  try {
    return formatUTM(p);
  } catch {
    return '—';
  }
}

/** Local clock time as written in the plan (its zone offset) and UTC. */
export function briefTimes(iso: string): { local: string; utc: string; date: string } {
  const d = new Date(iso);
  const m = /T(\d{2}:\d{2})(?::\d{2}(?:\.\d+)?)?(Z|[+-]\d{2}:\d{2})?$/.exec(iso);
  const zone = m?.[2] && m[2] !== 'Z' ? `UTC${m[2]}` : 'UTC';
  return {
    date: iso.slice(0, 10),
    local: m ? `${m[1]} ${zone}` : iso,
    utc: Number.isNaN(d.getTime())
      ? '—'
      : `${d.toISOString().slice(11, 16)} UTC ${d.toISOString().slice(0, 10)}`,
  };
}

/** Release order: by release time on a moving track, else as listed. */
export function scheduleOrder(result: PlanResult): SiteResult[] {
  if (result.track.groundSpeed_mps <= 0) return [...result.sites];
  return [...result.sites].sort((a, b) => a.release.time_s - b.release.time_s);
}

function scheduleRows(plan: Plan, result: PlanResult): string {
  const moving = result.track.groundSpeed_mps > 0;
  const msl = result.releaseAltitudeMSL_m;
  const agl = msl - plan.groundElevation_m;
  return scheduleOrder(result)
    .map((s, i) => {
      const rp = moving
        ? (s.releaseWindow?.best ?? s.release)
        : (s.releaseZone?.center ?? s.release);
      const when = moving
        ? s.releaseWindow
          ? `<b class="big">${s.releaseWindow.openUnbounded ? 'before ' : ''}${signed(s.releaseWindow.open_s)} … ${s.releaseWindow.closeUnbounded ? 'after ' : ''}${signed(s.releaseWindow.close_s)} s</b><br>best ${signed(s.releaseWindow.best_s)} s`
          : `<span class="bad">no window</span><br>closest ${signed(s.release.time_s)} s`
        : s.releaseZone
          ? `hover within <b class="big">${s.releaseZone.unbounded ? 'more than ' : ''}${f(s.releaseZone.radius_m, 0)} m</b>`
          : '<span class="bad">no hover zone</span>';
      const prog =
        s.headingTrue_deg === undefined
          ? '—'
          : `<b class="big">${f(s.headingTrue_deg, 0)}° T</b><br>${s.headingMag_deg === null || s.headingMag_deg === undefined ? 'mag. n/a' : `${f(s.headingMag_deg, 0)}° M`}`;
      const colour =
        PRINT_COLOURS[
          Math.max(
            0,
            plan.variants.findIndex((v) => v.id === s.variant),
          ) % PRINT_COLOURS.length
        ];
      return `<tr data-site="${esc(s.id)}">
  <td class="num big">${i + 1}</td>
  <td><b class="big">${esc(s.id)}</b><br><span class="small">${esc(s.name)}</span></td>
  <td>${variantCell(s, colour)}</td>
  <td class="pos">${rp.lat.toFixed(6)}, ${rp.lon.toFixed(6)}<br>${esc(mgrsOf(rp))}<br><span class="small">${esc(utmOf(rp))}</span></td>
  <td class="num">${f(agl, 0)}<br><span class="small">${f(msl, 0)} MSL</span></td>
  <td class="num">${moving ? `${f(result.track.trackDeg, 0)}°` : 'hover'}</td>
  <td class="when">${when}</td>
  <td class="num">${prog}</td>
  <td class="num big">${s.thrustTime_s === undefined ? '—' : f(s.thrustTime_s)}</td>
  <td class="num big ${s.meetsRequired ? '' : 'bad'}" data-col="phit">${phitCell(s)}</td>
  <td class="num" data-col="cep">${f(s.cep_m)}</td>
  <td class="num small">${f(s.ellipse95.semiMajor_m)} × ${f(s.ellipse95.semiMinor_m)}<br>@ ${f(s.ellipse95.azimuth_deg, 0)}°</td>
</tr>`;
    })
    .join('\n');
}

/** The site's variant, or that none can reach it (the data still names the best P(hit) one). */
function variantCell(s: SiteResult, colour: string): string {
  if (!s.pinned && s.recommendation?.kind === 'unreachable')
    return '<span class="bad">no variant can reach this site</span>';
  return `<span class="sw" style="background:${colour}"></span>${esc(s.variant)}${s.pinned ? ' (pinned)' : ''}`;
}

/** P(hit) large, its standard error small under it: "0.91 ± 0.01" as text. */
function phitCell(s: SiteResult): string {
  const { p, se } = pHitParts(s.pHit, s.pHitSE);
  return se === null ? esc(p) : `${esc(p)} <br><span class="small se">± ${esc(se)}</span>`;
}

/** Smallest and largest of finite values as "a" or "a–b" (one decimal), or null when none. */
function span(values: number[]): string | null {
  const v = values.filter((x) => Number.isFinite(x) && x > 0);
  if (v.length === 0) return null;
  const lo = f(Math.min(...v));
  const hi = f(Math.max(...v));
  return lo === hi ? lo : `${lo}–${hi}`;
}

/**
 * The error sources the Monte Carlo flew, each with its size and origin; gusts and vertical air
 * with the effective values of the sites' falls.
 */
function uncertaintySection(plan: Plan, result: PlanResult): string {
  const src = result.errorSources;
  if (src.length === 0)
    return '<p>No error sources: every flight is the nominal one, so P(hit) is 0 or 1.</p>';
  const gust = span(result.sites.map((s) => s.gust_mps));
  const gustTime = span(result.sites.filter((s) => s.gust_mps > 0).map((s) => s.gustTime_s));
  const vert = span(result.sites.map((s) => s.verticalAir_mps));
  const items = src.map((e) => {
    let falls = '';
    if (e.id === 'gust' && gust)
      falls = `; in the sites’ falls ${gust} m/s per component, correlation time ${gustTime ?? '—'} s`;
    if (e.id === 'verticalAir' && vert) falls = `; in the sites’ falls ${vert} m/s`;
    return `<li data-source="${esc(e.id)}"><b>${esc(e.label)}</b>: ${esc(e.detail)}${esc(falls)}</li>`;
  });
  return `<ul class="sources">${items.join('')}</ul>
<p class="small">P(hit) is given ± its Monte Carlo standard error, √(p(1−p)/n) with n = ${plan.monteCarlo.samples} samples.</p>`;
}

function windRows(plan: Plan): string {
  if (plan.winds.layers.length === 0)
    return '<tr><td colspan="4">No wind layers: calm air assumed.</td></tr>';
  return plan.winds.layers
    .map(
      (l) =>
        `<tr><td class="num">${f(l.altitude_m, 0)} ${plan.winds.reference}</td><td class="num">${f(l.fromDeg, 0)}°</td>` +
        `<td class="num">${f(l.speed_mps)}</td><td class="num">${f(l.speed_mps / MPS_PER_KT)}</td></tr>`,
    )
    .join('');
}

/** Most site ids a check row names before "and n more". */
const MAX_CHECK_SITES = 40;

/** "Sites: s01, s04" under a check that names the sites it is about. */
function sitesLine(sites: readonly string[] | undefined): string {
  if (!sites || sites.length === 0) return '';
  const shown = sites.slice(0, MAX_CHECK_SITES).map(esc).join(', ');
  const more = sites.length > MAX_CHECK_SITES ? ` and ${sites.length - MAX_CHECK_SITES} more` : '';
  return `<br><span class="small">Site${sites.length === 1 ? '' : 's'}: ${shown}${more}</span>`;
}

function safetySection(s: BriefSafety | undefined): string {
  if (!s) {
    return `<section class="safety"><h2>Safety checklist</h2><p class="bad">The safety checks were not computed for this brief.</p></section>`;
  }
  const checks = s.checks
    .map(
      (c) =>
        `<tr class="st-${esc(c.status)}"><td class="state">${esc(c.status.toUpperCase())}</td><td><b>${esc(c.title)}</b><br>${esc(c.why)}${sitesLine(c.sites)}</td></tr>`,
    )
    .join('');
  const manual = (s.manual ?? [])
    .map(
      (m) =>
        `<tr><td class="state">${m.state === 'done' && !m.who?.trim() ? '☐ open (done, nobody named)' : m.state === 'done' ? '☑ done' : m.state === 'n/a' ? '— n/a' : '☐ open'}</td><td>${esc(m.text)}${m.note ? `<br><span class="small">${esc(m.note)}</span>` : ''}</td>` +
        `<td>${esc(m.who ?? '')}</td><td>${esc(m.when ?? '')}</td><td class="sign"></td></tr>`,
    )
    .join('');
  const r = s.readiness;
  const state = r
    ? r.ready
      ? r.overridden
        ? `<p class="bad big">MARKED READY WITH A FAILING CHECK — reason: ${esc(r.reason ?? '')} (${esc(r.who ?? '')}, ${esc(r.when ?? '')})</p>`
        : '<p class="big">State: READY</p>'
      : `<p class="bad big">State: NOT READY${r.blocking?.length ? ` — ${esc(r.blocking.join('; '))}` : ''}</p>`
    : '';
  return `<section class="safety"><div class="keep"><h2>Safety checklist</h2>${state}</div>
<h3>Automatic checks</h3><table class="checks"><tbody>${checks}</tbody></table>
${manual ? `<h3>Crew items</h3><table class="checks"><thead><tr><th>State</th><th>Item</th><th>Who</th><th>When</th><th>Initials</th></tr></thead><tbody>${manual}</tbody></table>` : ''}
</section>`;
}

/** Text as a CSS string literal: every character but letters, digits and spaces hex-escaped (CSS Syntax 3 §4.3.7), so plan text cannot end the string or the style element. */
export function cssString(text: string): string {
  const body = [...text]
    .map((ch) => (/[A-Za-z0-9 ]/.test(ch) ? ch : `\\${ch.codePointAt(0)!.toString(16)} `))
    .join('');
  return `"${body}"`;
}

/** Longest plan name printed in the page footers, characters. */
const FOOTER_NAME_MAX = 60;

/**
 * Print rules: the cover page in portrait, everything after it in one landscape flow (one forced
 * break only, so no half-empty page between sections); headings stay with what follows them;
 * "page N of M" in the bottom margin of every page (CSS Paged Media margin boxes).
 */
const STYLE = (paper: string, name: string) => {
  const short =
    [...name].length > FOOTER_NAME_MAX
      ? `${[...name].slice(0, FOOTER_NAME_MAX - 1).join('')}…`
      : name;
  return `
@page {
  size: ${paper}; margin: 12mm 12mm 14mm;
  @bottom-left { content: ${cssString(`Drop brief: ${short}`)}; font: 8pt 'DejaVu Sans', sans-serif; color: #444; }
  @bottom-right { content: "page " counter(page) " of " counter(pages); font: 8pt 'DejaVu Sans', sans-serif; color: #111; }
}
@page wide { size: ${paper} landscape; margin: 10mm 12mm 13mm; }
* { box-sizing: border-box; }
body { font: 10.5pt/1.35 'DejaVu Sans', system-ui, sans-serif; color: #111; margin: 0; }
h1 { font-size: 18pt; margin: 0 0 2mm; }
h2 { font-size: 13pt; margin: 5mm 0 2mm; border-bottom: 1.5pt solid #1c2b27; }
h3 { font-size: 11pt; margin: 3mm 0 1mm; }
h1, h2, h3, .keep { break-after: avoid; page-break-after: avoid; }
.keep, .figure, .caution, .sigs, .meta, p { break-inside: avoid; }
table { border-collapse: collapse; width: 100%; }
th, td { border: 0.6pt solid #888; padding: 1.2mm 1.5mm; vertical-align: top; }
th { background: #e8ecea; font-size: 9pt; text-align: left; }
thead { display: table-header-group; }
tr { break-inside: avoid; }
.num { text-align: right; font-variant-numeric: tabular-nums; }
.big { font-size: 13pt; font-weight: 700; }
.small { font-size: 8.5pt; color: #333; }
.bad { color: #b42318; font-weight: 700; }
.warnc { color: #9a6700; font-weight: 700; }
.pos { font-family: 'DejaVu Sans Mono', monospace; font-size: 9pt; }
.sw { display: inline-block; width: 8pt; height: 8pt; margin-right: 3pt; border-radius: 1pt; }
.caution { border: 2pt solid #b7791f; background: #fff4d6; padding: 2mm 3mm; font-weight: 600; margin: 3mm 0; }
.meta { display: grid; grid-template-columns: 1fr 1fr; gap: 1mm 8mm; }
.meta div b { display: inline-block; min-width: 34mm; }
.sigs { display: grid; grid-template-columns: 1fr 1fr; gap: 8mm; margin-top: 4mm; }
.sigs div { border-bottom: 0.8pt solid #111; height: 11mm; font-size: 9pt; }
.sign { width: 20mm; }
.checks .state { width: 22mm; font-weight: 700; }
.st-fail .state { color: #b42318; } .st-warn .state { color: #9a6700; } .st-pass .state { color: #1a7f37; }
.figure { text-align: center; }
.figure svg { max-width: 100%; height: auto; border: 0.6pt solid #888; }
.cover .figure svg { width: auto; height: ${paper === 'Letter' ? 112 : 132}mm; max-width: 100%; }
.wide { page: wide; }
.schedule .pos { white-space: nowrap; }
.schedule td.when { white-space: nowrap; }
.se { font-weight: 400; white-space: nowrap; }
.sources { margin: 1mm 0; padding-left: 5mm; }
.sources li { margin-bottom: 0.8mm; break-inside: avoid; }
.two { display: grid; grid-template-columns: 1fr 1fr; gap: 6mm; align-items: start; }
.windgrid { display: grid; grid-template-columns: 58mm 1fr 84mm; gap: 5mm; align-items: start; break-inside: avoid; }
.windgrid h3 { margin-top: 0; }
.energytab td, .zonelist td { padding: 0.8mm 1.5mm; }
.hz { break-inside: avoid; }
.hzgrid { display: grid; grid-template-columns: 130mm 1fr; gap: 6mm; align-items: start; }
.hzgrid .figure svg { width: 100%; }
.corners { columns: 4; column-gap: 4mm; margin: 1mm 0; padding-left: 8mm; font-family: 'DejaVu Sans Mono', monospace; font-size: 7.8pt; }
.corners li { break-inside: avoid; white-space: nowrap; }
.ring { margin: 2mm 0 0; font-weight: 700; }
.tgrid { display: grid; grid-template-columns: 1fr 1fr 1fr; gap: 2mm 4mm; align-items: start; }
.tprof { break-inside: avoid; }
.tprof .figure svg { width: 100%; }
.tprof p { margin: 0.5mm 0 1mm; }
.printbar { position: sticky; top: 0; background: #1f3a34; color: #fff; padding: 3mm; display: flex; gap: 4mm; align-items: center; }
.printbar button { font: inherit; font-weight: 700; padding: 1.5mm 5mm; }
@media print { .printbar { display: none; } }
@media screen { body { max-width: 270mm; margin: 0 auto; padding: 0 4mm; } }
footer { margin-top: 4mm; font-size: 8.5pt; color: #444; }
`;
};

/** The atmosphere used: the sounding's hydrostatic air when the plan has one, else the ISA offset. */
function atmosphereText(plan: Plan, msl: number): string {
  const snd = plan.atmosphere.sounding;
  if (snd && snd.levels.length) {
    const atm = new SoundingAtmosphere(snd.levels, {
      reference: snd.reference ?? 'MSL',
      groundElevation_m: plan.groundElevation_m,
      surfacePressure_Pa:
        snd.surfacePressure_hPa === undefined ? undefined : snd.surfacePressure_hPa * 100,
    });
    const a = atm.airAt(msl);
    return `<p>From a sounding of ${snd.levels.length} temperature level(s). At release: ${f(a.temperature_K - 273.15)} °C, ${f(a.pressure_Pa / 100)} hPa, density ${f(a.density_kgm3, 3)} kg/m³.</p>`;
  }
  const air = airAt(msl, plan.atmosphere.isaOffset_K);
  const off = plan.atmosphere.isaOffset_K;
  return `<p>ISA ${off >= 0 ? '+' : '−'}${f(Math.abs(off))} K. At release: ${f(air.temperature_K - 273.15)} °C, ${f(air.pressure_Pa / 100)} hPa, density ${f(air.density_kgm3, 3)} kg/m³.</p>`;
}

/** The complete brief as an HTML document. */
export function briefHtml(plan: Plan, result: PlanResult, opts: BriefOptions = {}): string {
  const paper = opts.paper ?? 'A4';
  const t = briefTimes(plan.time);
  const rp = result.releasePoint;
  const msl = result.releaseAltitudeMSL_m;
  const agl = msl - plan.groundElevation_m;
  const moving = result.track.groundSpeed_mps > 0;
  const made = (opts.generatedAt ?? new Date()).toISOString().slice(0, 16).replace('T', ' ');
  const u = plan.uncertainty;
  const zones = opts.safety?.zones ?? [];
  const drawn = [
    'sites (green: meet the required P(hit); red: do not)',
    '95 % landing ellipses and reach areas (dashed) of each site’s variant',
    moving ? 'release windows on the carrier track (thick)' : 'hover release zones (dotted)',
    'release point ◆',
    ...(opts.safety?.hazardRings ? ['hazard area (red outline)'] : []),
    ...(zones.length ? ['no-drop zones (grey, named)'] : []),
  ];
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'">
<title>Drop brief — ${esc(plan.name)}</title>
<style>${STYLE(paper, plan.name)}</style></head>
<body>
${opts.printBar ? `<div class="printbar"><button type="button" data-action="print">Print brief</button><span>${paper} · choose “Save as PDF” in the print dialog for a file; page numbers print in the bottom margin.</span></div>` : ''}
<div class="cover">
<h1>Drop brief: ${esc(plan.name)}</h1>
<div class="caution" role="note">CAUTION — ${esc(CAUTION_TEXT)}</div>
<section class="meta">
  <div><b>Date</b> ${esc(t.date)}</div>
  <div><b>Release time</b> <span class="big">${esc(t.local)}</span> (${esc(t.utc)})</div>
  <div><b>Place</b> ${rp.lat.toFixed(6)}, ${rp.lon.toFixed(6)} · ${esc(formatDMS(rp))}</div>
  <div><b>Release point</b> MGRS ${esc(mgrsOf(rp))} · UTM ${esc(utmOf(rp))}</div>
  <div><b>Release altitude</b> <span class="big">${f(agl, 0)} m AGL</span> (${f(msl, 0)} m MSL, ${f(agl / M_PER_FT, 0)} ft AGL)</div>
  <div><b>Carrier aircraft</b> ${moving ? `${f(result.track.groundSpeed_mps)} m/s (${f(result.track.groundSpeed_mps / MPS_PER_KT)} kt) on track ${f(result.track.trackDeg, 0)}° true` : 'hovering at each site’s hover point'}</div>
  <div><b>Declination</b> ${result.declination_deg === null ? 'unavailable' : `${f(Math.abs(result.declination_deg), 2)}° ${result.declination_deg >= 0 ? 'E' : 'W'} (${esc(result.declinationModel)}, valid ${WMM_VALIDITY.validFrom.slice(0, 10)} to ${WMM_VALIDITY.validTo.slice(0, 10)}, for ${esc(t.date)})`}</div>
  <div><b>Required P(hit)</b> ${f(plan.requiredPHit, 2)} · ${plan.monteCarlo.samples} samples, seed ${plan.monteCarlo.seed}</div>
</section>
<div class="sigs"><div>Prepared by (name, signature, date)</div><div>Approved by (name, signature, date)</div></div>
<section class="figure"><h2>Overview</h2>${overviewSvg(plan, result, {
    hazardRings: opts.safety?.hazardRings,
    zones: zones.map((z) => ({ name: z.name, rings: z.rings })),
  })}
<p class="small">${esc(drawn.join(', '))}.</p></section>
</div>
<div class="wide">
<section class="schedule"><div class="keep"><h2>Release schedule</h2>
<p>${moving ? 'Times are seconds relative to passing the release point (− before, + after). Release point column: the best release point.' : 'Release point column: the hover point for each site.'}</p></div>
<table class="sched"><thead><tr><th>#</th><th>Site</th><th>Variant</th><th>Release point (dec. °, MGRS, UTM)</th><th>Alt. m AGL</th><th>Carrier hdg</th><th>${moving ? 'Window' : 'Hover'}</th><th>Programmed heading</th><th>Thrust s</th><th>P(hit)</th><th>CEP m</th><th>95 % ellipse m</th></tr></thead>
<tbody>${scheduleRows(plan, result)}</tbody></table>
<p class="small" data-testid="included">${esc(includedText(result.errorSources))} P(hit) ± its Monte Carlo standard error.</p>
${result.warnings.map((w) => `<p class="bad">${esc(w)}</p>`).join('')}
</section>
${energySection(plan, result)}${terrainSection(plan, result, { note: opts.terrainNote, order: scheduleOrder(result) })}
${timelineSection(plan, opts.timeline, { omitted: opts.timelineOmitted })}
<section class="winds"><div class="keep"><h2>Winds</h2></div><div class="windgrid">
<div><table><thead><tr><th>Altitude m</th><th>From</th><th>m/s</th><th>kt</th></tr></thead><tbody>${windRows(plan)}</tbody></table>
<p class="small">Below the lowest layer the speed follows a power law with α = ${f(plan.winds.surfaceExponent, 3)}. Wind error σ ${f(u.windSpeed_mps)} m/s per component, correlated over ${f(u.windCorrelation_m, 0)} m.</p></div>
<div class="figure"><h3>Wind profile</h3>${windPlotSvg(plan, result)}</div>
<div class="figure"><h3>Hodograph</h3>${hodographSvg(plan, { releaseAltitudeMSL_m: result.releaseAltitudeMSL_m, width_px: 400, height_px: 380 })}</div>
</div></section>
<section class="two"><div><div class="keep"><h2>Atmosphere</h2>${atmosphereText(plan, msl)}</div>
${opts.sweep ? '' : '</div><div>'}<div class="keep"><h2>Uncertainty (1σ)</h2></div>${uncertaintySection(plan, result)}</div>
${opts.sweep ? `<div class="figure"><h2>P(hit) and CEP against release altitude</h2>${sweepSvg(opts.sweep.points, { requiredPHit: plan.requiredPHit, title: opts.sweep.title })}</div>` : ''}</section>
${safetySection(opts.safety)}
${zonesSection(opts.safety)}
${hazardSection(result, opts.safety)}
<div class="caution">CAUTION — ${esc(CAUTION_TEXT)}</div>
<footer>Seedfall drop brief · generated ${esc(made)} UTC · reduced model: check figures against conditions on the day.</footer>
</div>
</body></html>
`;
}
