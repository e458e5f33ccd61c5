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
import { hodographSvg, sweepSvg } from './wind-plots';
import {
  includedText,
  type PlanResult,
  pHitText,
  type SiteResult,
  type SweepPoint,
} from '../planner';
import type { Plan } from '../plan';

/** Safety state to print (from the checklist panel and the automatic checks). */
export interface BriefSafety {
  checks: { id?: string; title: string; status: string; why: string }[];
  hazardRings?: [number, number][][];
  hazardArea_m2?: number;
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
  <td><span class="sw" style="background:${colour}"></span>${esc(s.variant)}${s.pinned ? ' (pinned)' : ''}</td>
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

/** P(hit) large, its standard error small under it: "0.91 ± 0.01" as text. */
function phitCell(s: SiteResult): string {
  const [p, se] = pHitText(s.pHit, s.pHitSE).split(' ± ');
  return se === undefined ? esc(p) : `${esc(p)} <br><span class="small se">± ${esc(se)}</span>`;
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

function safetySection(s: BriefSafety | undefined): string {
  if (!s) {
    return `<section class="safety"><h2>Safety checklist</h2><p class="bad">The safety checks were not computed for this brief.</p></section>`;
  }
  const checks = s.checks
    .map(
      (c) =>
        `<tr class="st-${esc(c.status)}"><td class="state">${esc(c.status.toUpperCase())}</td><td><b>${esc(c.title)}</b><br>${esc(c.why)}</td></tr>`,
    )
    .join('');
  const manual = (s.manual ?? [])
    .map(
      (m) =>
        `<tr><td class="state">${m.state === 'done' ? '☑ done' : m.state === 'n/a' ? '— n/a' : '☐ open'}</td><td>${esc(m.text)}${m.note ? `<br><span class="small">${esc(m.note)}</span>` : ''}</td>` +
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
  return `<section class="safety"><h2>Safety checklist</h2>${state}
<h3>Automatic checks</h3><table class="checks"><tbody>${checks}</tbody></table>
${manual ? `<h3>Crew items</h3><table class="checks"><thead><tr><th>State</th><th>Item</th><th>Who</th><th>When</th><th>Initials</th></tr></thead><tbody>${manual}</tbody></table>` : ''}
</section>`;
}

function hazardSection(s: BriefSafety | undefined): string {
  const rings = s?.hazardRings;
  if (!rings || rings.length === 0) return '';
  const rows = rings
    .map((ring, k) => {
      // Every vertex would be too many to read; print every n-th so about 24 remain per ring.
      const step = Math.max(1, Math.ceil(ring.length / 24));
      const pts = ring.filter((_, i) => i % step === 0);
      return `<p><b>Ring ${k + 1}</b> (${ring.length} vertices, every ${step === 1 ? '' : `${step}th `}listed):</p><p class="coords">${pts
        .map(([lat, lon]) => `${lat.toFixed(6)}, ${lon.toFixed(6)}`)
        .join(' · ')}</p>`;
    })
    .join('');
  return `<section class="hazard"><h2>Hazard area — keep people clear</h2>
<p>Area ${s?.hazardArea_m2 !== undefined ? `${f(s.hazardArea_m2 / 10000, 2)} ha (${f(s.hazardArea_m2, 0)} m²)` : '—'}.</p>${rows}</section>`;
}

const STYLE = (paper: string) => `
@page { size: ${paper}; margin: 12mm; }
@page schedule { size: ${paper} landscape; margin: 10mm; }
* { box-sizing: border-box; }
body { font: 10.5pt/1.35 'DejaVu Sans', system-ui, sans-serif; color: #111; margin: 0; }
h1 { font-size: 18pt; margin: 0 0 2mm; }
h2 { font-size: 13pt; margin: 5mm 0 2mm; border-bottom: 1.5pt solid #1c2b27; }
h3 { font-size: 11pt; margin: 3mm 0 1mm; }
table { border-collapse: collapse; width: 100%; }
th, td { border: 0.6pt solid #888; padding: 1.2mm 1.5mm; vertical-align: top; }
th { background: #e8ecea; font-size: 9pt; text-align: left; }
thead { display: table-header-group; }
tr { break-inside: avoid; }
.num { text-align: right; font-variant-numeric: tabular-nums; }
.big { font-size: 13pt; font-weight: 700; }
.small { font-size: 8.5pt; color: #333; }
.bad { color: #b42318; font-weight: 700; }
.pos { font-family: 'DejaVu Sans Mono', monospace; font-size: 9pt; }
.sw { display: inline-block; width: 8pt; height: 8pt; margin-right: 3pt; border-radius: 1pt; }
.caution { border: 2pt solid #b7791f; background: #fff4d6; padding: 2mm 3mm; font-weight: 600; }
.meta { display: grid; grid-template-columns: 1fr 1fr; gap: 1mm 8mm; }
.meta div b { display: inline-block; min-width: 34mm; }
.sigs { display: grid; grid-template-columns: 1fr 1fr; gap: 8mm; margin-top: 4mm; }
.sigs div { border-bottom: 0.8pt solid #111; height: 11mm; font-size: 9pt; }
.sign { width: 20mm; }
.checks .state { width: 22mm; font-weight: 700; }
.st-fail .state { color: #b42318; } .st-warn .state { color: #9a6700; } .st-pass .state { color: #1a7f37; }
.figure { break-inside: avoid; text-align: center; }
.figure svg { max-width: 100%; height: auto; border: 0.6pt solid #888; }
.schedule { break-before: page; page: schedule; }
.schedule .pos { white-space: nowrap; }
.schedule td.when { white-space: nowrap; }
.two, section.safety, section.hazard { break-inside: avoid; }
.se { font-weight: 400; white-space: nowrap; }
.sources { margin: 1mm 0; padding-left: 5mm; }
.sources li { margin-bottom: 0.8mm; }
.coords { font-family: 'DejaVu Sans Mono', monospace; font-size: 8.5pt; }
.two { display: grid; grid-template-columns: 1fr 1fr; gap: 6mm; align-items: start; }
.printbar { position: sticky; top: 0; background: #1f3a34; color: #fff; padding: 3mm; display: flex; gap: 4mm; align-items: center; }
.printbar button { font: inherit; font-weight: 700; padding: 1.5mm 5mm; }
@media print { .printbar { display: none; } }
footer { margin-top: 6mm; font-size: 8.5pt; color: #444; }
`;

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
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'">
<title>Drop brief — ${esc(plan.name)}</title>
<style>${STYLE(paper)}</style></head>
<body>
${opts.printBar ? `<div class="printbar"><button type="button" data-action="print">Print brief</button><span>${paper} · choose “Save as PDF” in the print dialog for a file.</span></div>` : ''}
<h1>Drop brief: ${esc(plan.name)}</h1>
<div class="caution" role="note">CAUTION — ${esc(CAUTION_TEXT)}</div>
<section class="meta">
  <div><b>Date</b> ${esc(t.date)}</div>
  <div><b>Release time</b> <span class="big">${esc(t.local)}</span> (${esc(t.utc)})</div>
  <div><b>Place</b> ${rp.lat.toFixed(6)}, ${rp.lon.toFixed(6)} · ${esc(formatDMS(rp))}</div>
  <div><b>Release point</b> MGRS ${esc(mgrsOf(rp))} · UTM ${esc(utmOf(rp))}</div>
  <div><b>Release altitude</b> <span class="big">${f(agl, 0)} m AGL</span> (${f(msl, 0)} m MSL, ${f(agl / M_PER_FT, 0)} ft AGL)</div>
  <div><b>Carrier</b> ${moving ? `${f(result.track.groundSpeed_mps)} m/s (${f(result.track.groundSpeed_mps / MPS_PER_KT)} kt) on track ${f(result.track.trackDeg, 0)}° true` : 'hovering at each site’s hover point'}</div>
  <div><b>Declination</b> ${result.declination_deg === null ? 'unavailable' : `${f(Math.abs(result.declination_deg), 2)}° ${result.declination_deg >= 0 ? 'E' : 'W'} (${esc(result.declinationModel)}, valid ${WMM_VALIDITY.validFrom.slice(0, 10)} to ${WMM_VALIDITY.validTo.slice(0, 10)}, for ${esc(t.date)})`}</div>
  <div><b>Required P(hit)</b> ${f(plan.requiredPHit, 2)} · ${plan.monteCarlo.samples} samples, seed ${plan.monteCarlo.seed}</div>
</section>
<div class="sigs"><div>Prepared by (name, signature, date)</div><div>Approved by (name, signature, date)</div></div>
<section class="figure"><h2>Overview</h2>${overviewSvg(plan, result, { hazardRings: opts.safety?.hazardRings })}
<p class="small">Sites (green: meets the required P(hit); red: does not), 95 % landing ellipses and reach areas (dashed) of each site’s variant, ${moving ? 'release windows on the carrier track (thick)' : 'hover release zones (dotted)'}, release point ◆${opts.safety?.hazardRings ? ', hazard area (red outline)' : ''}.</p></section>
<section class="schedule"><h2>Release schedule</h2>
<p>${moving ? 'Times are seconds relative to passing the release point (− before, + after). Release point column: the best release point.' : 'Release point column: the hover point for each site.'}</p>
<table class="sched"><thead><tr><th>#</th><th>Site</th><th>Variant</th><th>Release point (dec. °, MGRS, UTM)</th><th>Alt. m AGL</th><th>Carrier hdg</th><th>${moving ? 'Window' : 'Hover'}</th><th>Programmed heading</th><th>Thrust s</th><th>P(hit)</th><th>CEP m</th><th>95 % ellipse m</th></tr></thead>
<tbody>${scheduleRows(plan, result)}</tbody></table>
<p class="small" data-testid="included">${esc(includedText(result.errorSources))} P(hit) ± its Monte Carlo standard error.</p>
${result.warnings.map((w) => `<p class="bad">${esc(w)}</p>`).join('')}
</section>
<section class="two"><div><h2>Winds</h2><table><thead><tr><th>Altitude m</th><th>From</th><th>m/s</th><th>kt</th></tr></thead><tbody>${windRows(plan)}</tbody></table>
<p class="small">Below the lowest layer the speed follows a power law with α = ${f(plan.winds.surfaceExponent, 3)}. Wind error σ ${f(u.windSpeed_mps)} m/s per component, correlated over ${f(u.windCorrelation_m, 0)} m.</p></div>
<div><h2>Atmosphere</h2>${atmosphereText(plan, msl)}
<h2>Uncertainty (1σ)</h2>${uncertaintySection(plan, result)}</div></section>
<section class="figure"><h3>Wind profile</h3>${windPlotSvg(plan, result)}
${opts.sweep ? `<h3>P(hit) and CEP against release altitude</h3>${sweepSvg(opts.sweep.points, { requiredPHit: plan.requiredPHit, title: opts.sweep.title })}` : ''}
<h3>Hodograph</h3>${hodographSvg(plan, { releaseAltitudeMSL_m: result.releaseAltitudeMSL_m, width_px: 400, height_px: 380 })}</section>
${safetySection(opts.safety)}
${hazardSection(opts.safety)}
<div class="caution">CAUTION — ${esc(CAUTION_TEXT)}</div>
<footer>Seedfall drop brief · generated ${esc(made)} UTC · reduced model: check figures against conditions on the day.</footer>
</body></html>
`;
}
