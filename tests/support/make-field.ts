/**
 * A plan with n sites spread over the demo plan's area, for speed benches and large-input tests.
 * Deterministic: the same (n, seed) gives the same plan file, byte for byte.
 */
import { readFileSync } from 'node:fs';
import { Rng } from '../../app/model/rng';
import type { PlanFile, Site } from '../../app/plan/plan';

const DEMO_URL = new URL('../../data/demo-plan.json', import.meta.url);
const TOLERANCES_M = [5, 8, 10, 15, 20, 25, 60];

const round = (x: number, d: number): number => Math.round(x * 10 ** d) / 10 ** d;

/**
 * The demo plan (its air, wind, release, variants and safety settings) with n generated sites
 * (0 ≤ n ≤ 1000, the schema's limit) inside the demo sites' bounding box grown by half its size
 * on each side. About one site in ten is pinned to a variant.
 */
export function makeField(n: number, seed = 1): PlanFile {
  if (!Number.isInteger(n) || n < 0 || n > 1000) {
    throw new RangeError(`makeField: n must be an integer from 0 to 1000 (got ${n})`);
  }
  const demo = JSON.parse(readFileSync(DEMO_URL, 'utf8')) as PlanFile;
  const lats = demo.sites.map((s) => s.lat);
  const lons = demo.sites.map((s) => s.lon);
  const [lat0, lat1] = [Math.min(...lats), Math.max(...lats)];
  const [lon0, lon1] = [Math.min(...lons), Math.max(...lons)];
  const dLat = lat1 - lat0;
  const dLon = lon1 - lon0;
  const rng = new Rng(seed);
  const ground = demo.groundElevation_m ?? 0;
  const variants = demo.variants.map((v) => v.id);
  const width = String(Math.max(3, String(n).length));
  const sites: Site[] = Array.from({ length: n }, (_, i) => {
    const id = `f${String(i + 1).padStart(Number(width), '0')}`;
    const site: Site = {
      id,
      name: `Field site ${i + 1}`,
      lat: round(lat0 - dLat / 2 + 2 * dLat * rng.uniform(), 6),
      lon: round(lon0 - dLon / 2 + 2 * dLon * rng.uniform(), 6),
      elevation_m: round(ground - 1 + 2 * rng.uniform(), 1),
      tolerance_m: TOLERANCES_M[rng.uint32() % TOLERANCES_M.length],
    };
    if (rng.uniform() < 0.1) site.variant = variants[rng.uint32() % variants.length];
    return site;
  });
  return { ...demo, name: `${demo.name} (${n} generated sites, seed ${seed})`, sites };
}
