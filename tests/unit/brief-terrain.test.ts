import { XMLValidator } from 'fast-xml-parser';
import { beforeAll, describe, expect, it } from 'vitest';
import { briefHtml, formatPlanText } from '../../app/brief';
import { BRIEF_TERRAIN_MAX_SITES, terrainSection } from '../../app/brief/brief-terrain';
import { readAsciiGrid } from '../../app/formats';
import { LocalFrame } from '../../app/model';
import { type Plan, validatePlan } from '../../app/plan';
import { planDrop, type PlanResult, terrainArea } from '../../app/planner';
import { makeField } from '../support/make-field';

const NAME = '<b>hill</b>&"x".asc';
const CELL = 0.001;

/** An ASCII grid of a plane rising 4 m per 100 m east over the plan's area (its own text). */
function planeGrid(plan: Plan): string {
  const b = terrainArea(plan);
  const frame = new LocalFrame(plan.release);
  const x0 = Math.floor(b.west / CELL) * CELL - 3 * CELL;
  const y0 = Math.floor(b.south / CELL) * CELL - 3 * CELL;
  const cols = Math.ceil((b.east - x0) / CELL) + 3;
  const rows = Math.ceil((b.north - y0) / CELL) + 3;
  const out = [
    `ncols ${cols}`,
    `nrows ${rows}`,
    `xllcorner ${x0}`,
    `yllcorner ${y0}`,
    `cellsize ${CELL}`,
  ];
  for (let r = 0; r < rows; r++) {
    const lat = y0 + (rows - r - 0.5) * CELL;
    const row: string[] = [];
    for (let c = 0; c < cols; c++) {
      const { x } = frame.toLocal({ lat, lon: x0 + (c + 0.5) * CELL });
      row.push((plan.groundElevation_m + 0.04 * x).toFixed(3));
    }
    out.push(row.join(' '));
  }
  return out.join('\n');
}

let plan: Plan;
let result: PlanResult;
let flat: PlanResult;
beforeAll(() => {
  const file = makeField(75, 5);
  file.monteCarlo = { samples: 40, seed: 1 };
  const v = validatePlan(file);
  if (!v.ok) throw new Error('field plan');
  plan = v.plan;
  const { dem } = readAsciiGrid(NAME, planeGrid(plan), { box: terrainArea(plan) });
  result = planDrop(plan, { terrain: dem });
  flat = planDrop(plan);
}, 120_000);

describe('the brief over terrain', () => {
  it('draws one ground profile per site up to the limit and says how many were left out', () => {
    expect(plan.sites.length).toBeGreaterThan(BRIEF_TERRAIN_MAX_SITES);
    const html = briefHtml(plan, result, { terrainNote: '10 × 10 cells read' });
    expect(html).toContain('<h2>Fall profile over the ground</h2>');
    const svgs = html.match(/<svg class="gprof"[\s\S]*?<\/svg>/g) ?? [];
    expect(svgs.length).toBe(BRIEF_TERRAIN_MAX_SITES);
    for (const s of svgs) expect(XMLValidator.validate(s)).toBe(true);
    const left = plan.sites.length - BRIEF_TERRAIN_MAX_SITES;
    expect(html).toContain(`${left} more site(s) left out of this section`);
    expect(html).toContain('10 × 10 cells read');
  });

  it('names the elevation model as text, never as markup', () => {
    const html = briefHtml(plan, result);
    expect(html).not.toContain('<b>hill');
    expect(html).toContain('&lt;b&gt;hill&lt;/b&gt;&amp;&quot;x&quot;.asc');
  });

  it('prints hidden ground as a warning, also for a site left out of the drawings', () => {
    const r = structuredClone(result);
    // Typed site elevations below the plane are hidden by it; start from none, then hide two.
    for (const s of r.sites) for (const v of s.byVariant) delete v.terrain?.hiddenBy;
    const hide = (i: number) => {
      const s = r.sites[i];
      const v = s.byVariant.find((x) => x.variant === s.variant)!;
      v.terrain!.hiddenBy = {
        lat: s.lat,
        lon: s.lon,
        ground_m: 120,
        aboveSite_m: 31,
        fromSite_m: 55,
      };
    };
    hide(0);
    hide(r.sites.length - 1);
    const html = terrainSection(plan, r, { maxSites: 1 });
    expect(
      html.match(
        /class="bad">Hidden ground: the descent aimed at this site meets ground 31 m above it, 55 m from it/g,
      ),
    ).toHaveLength(1);
    expect(html).toContain(`Hidden ground at 1 of them: ${r.sites[r.sites.length - 1].id}.`);
    expect(formatPlanText(plan, r)).toContain(
      `  ${r.sites[0].id}: Hidden ground: the descent aimed at this site meets ground 31 m above it`,
    );
  });

  it("says where each site's elevation came from: the model, typed, or the plan's ground", () => {
    const r = structuredClone(result);
    const [a, b, c] = r.sites;
    a.ground = { elevation_m: 101.25, source: 'terrain', terrain_m: 101.25 };
    b.ground = { elevation_m: 90, source: 'typed', terrain_m: 97.5 };
    // The planner falls back to the plan's ground, with a warning, where the model has no height.
    c.ground = { elevation_m: plan.groundElevation_m, source: 'plan-ground', terrain_m: null };
    const html = terrainSection(plan, r, { maxSites: 3 });
    const fig = (id: string) => html.split(`data-site="${id}"`)[1].split('</div>\n')[1];
    expect(fig(a.id)).toContain('site 101.3 m MSL, from the elevation model');
    expect(fig(b.id)).toContain('site 90.0 m MSL, typed in the plan (model: 97.5 m)');
    expect(fig(c.id)).toContain('the plan&#39;s ground (the model has no height at the site)');
    expect(fig(c.id)).not.toContain('from the elevation model');
    const text = formatPlanText(plan, r).split('\n');
    // The ground table follows the results table: its row is the id's last.
    const row = (id: string) => text.filter((l) => l.startsWith(`${id} `)).pop() ?? '';
    expect(row(a.id)).toMatch(/ 101\.3 +terrain /);
    expect(row(b.id)).toMatch(/ 90\.0 +typed \(model 97\.5\) /);
    expect(row(c.id)).toContain('plan ground (no model height)');
  });

  it('leaves the brief and the text report as they were without an elevation model', () => {
    expect(terrainSection(plan, flat)).toBe('');
    expect(briefHtml(plan, flat)).not.toContain('Fall profile over the ground');
    expect(formatPlanText(plan, flat)).not.toContain('Terrain:');
    expect(formatPlanText(plan, result)).toContain(`Terrain: ${NAME}`);
  });
});
