/**
 * The brief's areas: the hazard area as a drawing with its outline simplified to a short list of
 * numbered corners (tolerance stated), and the no-drop zones listed.
 */
import type { BriefSafety } from './brief-html';
import { esc, fitView, niceStep } from './brief-svg';
import { simplifyRings, type XY } from './outline';
import { LocalFrame } from '../model';
import type { PlanResult } from '../planner';

/** Tolerance the hazard outline is first simplified to, m; doubled while too many corners remain. */
export const HAZARD_TOLERANCE_M = 5;
/** Most corners the brief lists for the whole hazard outline. */
export const HAZARD_MAX_CORNERS = 60;

const f = (v: number, d: number): string => (Number(v.toFixed(d)) || 0).toFixed(d);
const r1 = (v: number): string => (Math.round(v * 10) / 10).toString();

/** Drawing of the hazard area: the full outline filled, the simplified one with numbered corners. */
function hazardSvg(full: XY[][], simple: XY[][], zones: XY[][], sites: XY[], W = 520): string {
  const pts = [...full.flat(), ...simple.flat(), { x: 0, y: 0 }];
  // As tall as the area needs within limits, so a wide area leaves room for the list beside it.
  const { H, scale, tx, ty } = fitView(pts, W, 0.1, (w, h) =>
    Math.round(Math.min(420, Math.max(240, (W * h) / w))),
  );
  const poly = (r: XY[]): string => r.map((p) => `${r1(tx(p.x))},${r1(ty(p.y))}`).join(' ');
  const inView = (p: XY): boolean => tx(p.x) >= 0 && tx(p.x) <= W && ty(p.y) >= 0 && ty(p.y) <= H;
  let k = 0;
  const labels = simple
    .map((r) =>
      r
        .map((p) => {
          k += 1;
          return `<circle cx="${r1(tx(p.x))}" cy="${r1(ty(p.y))}" r="2.5"/><text x="${r1(tx(p.x) + 4)}" y="${r1(ty(p.y) - 4)}">${k}</text>`;
        })
        .join(''),
    )
    .join('');
  const bar = niceStep(W / scale, 5);
  const rx = tx(0);
  const ry = ty(0);
  return `<svg class="hazardmap" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" width="${W}" height="${H}" role="img" aria-label="Hazard area">
<style>.hazardmap{background:#fff;font:10px 'DejaVu Sans',system-ui,sans-serif}
.hazardmap .full{fill:#d92d20;fill-opacity:0.10;stroke:#d92d20;stroke-opacity:0.45;stroke-width:1}
.hazardmap .simple{fill:none;stroke:#7a1a12;stroke-width:1.6}
.hazardmap .zone{fill:#555;fill-opacity:0.25;stroke:#222;stroke-width:1.2}
.hazardmap .site{fill:#1c2b27}.hazardmap circle{fill:#7a1a12}
.hazardmap text{font-weight:700;paint-order:stroke;stroke:#fff;stroke-width:3px}
.hazardmap .release{fill:#1c2b27;stroke:#fff;stroke-width:1.2}.hazardmap .scale rect{fill:#1c2b27}</style>
<rect width="${W}" height="${H}" fill="#fff"/>
${full.map((r) => `<polygon class="full" points="${poly(r)}"/>`).join('')}
${zones.map((r) => `<polygon class="zone" points="${poly(r)}"/>`).join('')}
${simple.map((r) => `<polygon class="simple" points="${poly(r)}"/>`).join('')}
${sites
  .filter(inView)
  .map(
    (p) =>
      `<rect class="site" x="${r1(tx(p.x) - 1.5)}" y="${r1(ty(p.y) - 1.5)}" width="3" height="3"/>`,
  )
  .join('')}
<path class="release" d="M${r1(rx)},${r1(ry - 7)} L${r1(rx + 7)},${r1(ry)} L${r1(rx)},${r1(ry + 7)} L${r1(rx - 7)},${r1(ry)} Z"/>
${labels}
<g class="scale" transform="translate(${r1(W - 16 - bar * scale)},${H - 16})"><rect width="${r1(bar * scale)}" height="5"/><text x="0" y="-4">0</text><text x="${r1(bar * scale)}" y="-4" text-anchor="end">${bar} m</text></g>
<text x="${W - 14}" y="18" text-anchor="middle">N ↑</text>
</svg>`;
}

/** The hazard area section: its size, the drawing and the simplified corners with the tolerance. */
export function hazardSection(result: PlanResult, s: BriefSafety | undefined): string {
  const rings = s?.hazardRings?.filter((r) => r.length >= 3) ?? [];
  if (!s || rings.length === 0) return '';
  const frame = new LocalFrame(result.releasePoint);
  const local = rings.map((r) => r.map(([lat, lon]) => frame.toLocal({ lat, lon })));
  const { rings: simple, tolerance_m } = simplifyRings(
    local,
    HAZARD_TOLERANCE_M,
    HAZARD_MAX_CORNERS,
  );
  const vertices = local.reduce((a, r) => a + r.length, 0);
  const corners = simple.reduce((a, r) => a + r.length, 0);
  const zones = (s.zones ?? []).flatMap((z) =>
    z.rings.map((r) => r.map(([lat, lon]) => frame.toLocal({ lat, lon }))),
  );
  let k = 0;
  const list = simple
    .map((r, i) => {
      const items = r
        .map((p) => {
          k += 1;
          const ll = frame.toLatLon(p.x, p.y);
          return `<li value="${k}">${f(ll.lat, 6)}, ${f(ll.lon, 6)}</li>`;
        })
        .join('');
      return `${simple.length > 1 ? `<p class="ring">Part ${i + 1} (${r.length} corners)</p>` : ''}<ol class="corners">${items}</ol>`;
    })
    .join('');
  const area =
    s.hazardArea_m2 !== undefined
      ? `${f(s.hazardArea_m2 / 10000, 2)} ha (${f(s.hazardArea_m2, 0)} m²)`
      : '—';
  const buffer =
    s.hazardBuffer_m !== undefined ? `, including its ${f(s.hazardBuffer_m, 0)} m buffer` : '';
  const drawing = hazardSvg(
    local,
    simple,
    zones,
    result.sites.map((x) => frame.toLocal(x)),
  );
  // Heading, drawing and tolerance stay on one page; the corner list may run on.
  return `<section class="hazard"><div class="hz"><h2>Hazard area — keep people clear</h2>
<div class="hzgrid"><div class="figure">${drawing}</div>
<div><p>Area ${area}${buffer}: every 99 % landing ellipse over its release window or zone, and the ground under the releases.</p>
<p data-testid="hazard-tolerance"><b>Outline simplified to within ${f(tolerance_m, 0)} m; ${corners} corners</b> (of ${vertices} vertices). The simplified outline stays within ${f(tolerance_m, 0)} m of the full one: keep people that much farther out.</p>
<p class="small">Shaded: the full outline; dark line and numbers: the corners listed below (lat, lon in decimal degrees, WGS84); grey: no-drop zones; ◆ release point; ▪ sites.</p></div></div></div>
${list}</section>`;
}

/** The no-drop zones: name, corners, and the site that comes nearest with its clearance. */
export function zonesSection(s: BriefSafety | undefined): string {
  const zones = s?.zones ?? [];
  if (zones.length === 0) return '';
  const buffer = s?.noDropBuffer_m;
  const rows = zones
    .map((z) => {
      const n = z.nearest;
      const near = n
        ? `${esc(n.site)}: ${n.clearance_m <= 0 ? '<b class="bad">0 m (overlapping)</b>' : `${buffer !== undefined && n.clearance_m < buffer ? `<b class="bad">${f(n.clearance_m, 1)} m</b>` : `${f(n.clearance_m, 1)} m`}`}`
        : '—';
      return `<tr><td>${esc(z.name)}</td><td class="num">${z.corners}${z.holes ? ` (${z.holes} hole${z.holes === 1 ? '' : 's'})` : ''}</td><td>${near}</td></tr>`;
    })
    .join('');
  return `<section class="zones"><h2>No-drop zones</h2>
<table class="zonelist"><thead><tr><th>Zone</th><th>Corners</th><th>Nearest landing: site, clearance of its 99 % ellipse over the window or zone</th></tr></thead><tbody>${rows}</tbody></table>
<p class="small">Drawn grey on the overview and the hazard drawing.${buffer !== undefined ? ` Required clearance ${f(buffer, 0)} m.` : ''}</p></section>`;
}
