/**
 * Screen layout of the map's marks, pure (no Leaflet, no DOM) so unit tests run it in Node:
 * lanes for release windows beside the shared track, and site labels placed without overlap.
 */

/** A box in screen pixels: left, top, right, bottom. */
export interface Box {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

const overlaps = (a: Box, b: Box): boolean =>
  a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;

/**
 * A lane per window so that windows whose intervals (s, along the track) overlap, or come within
 * gap_s of each other, never share one: greedy interval colouring in order of opening, which
 * uses the fewest lanes possible for intervals. Past maxLanes, lanes are reused (k mod maxLanes).
 */
export function windowLanes(
  windows: readonly { open_s: number; close_s: number }[],
  maxLanes = 12,
  gap_s = 0,
): number[] {
  const order = windows.map((_, i) => i).sort((a, b) => windows[a].open_s - windows[b].open_s);
  const laneEnd: number[] = [];
  const lanes = new Array<number>(windows.length).fill(0);
  for (const i of order) {
    const w = windows[i];
    let k = laneEnd.findIndex((end) => end + gap_s < w.open_s);
    if (k < 0) {
      k = laneEnd.length;
      laneEnd.push(w.close_s);
    } else laneEnd[k] = w.close_s;
    lanes[i] = k % Math.max(1, maxLanes);
  }
  return lanes;
}

/**
 * Signed offset (in lane widths) of lane k beside a line: 1, −1, 2, −2, … so lanes alternate
 * sides and none lies on the line itself.
 */
export function laneSide(k: number): number {
  const step = Math.floor(k / 2) + 1;
  return k % 2 === 0 ? step : -step;
}

/** A label to place: its anchor (the marker's centre, px) and text size (px). */
export interface LabelRequest {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** Where a label went: its box's offset from the anchor (px), or null when it did not fit. */
export interface LabelPlace {
  dx: number;
  dy: number;
  /** Placed away from its marker: draw a leader line to it. */
  leader: boolean;
}

/**
 * Greedy label placement: each label in the given order (most important first) takes the first
 * of eight candidate positions around its marker (right, left, above, below, then the corners),
 * then the same eight twice as far out (with a leader line), whose box overlaps no placed label,
 * no marker (a square of markerSize px about each anchor) and stays inside `bounds`. A label with
 * no free candidate is left out (null).
 */
export function placeLabels(
  labels: readonly LabelRequest[],
  opts: { markerSize: number; bounds?: Box; gap?: number },
): (LabelPlace | null)[] {
  const r = opts.markerSize / 2;
  const gap = opts.gap ?? 3;
  // Markers as obstacles, in a coarse grid so a 1,000-site plan stays fast.
  const cell = 64;
  const grid = new Map<string, Box[]>();
  const cellsOf = (b: Box): string[] => {
    const out: string[] = [];
    for (let cx = Math.floor(b.x0 / cell); cx <= Math.floor(b.x1 / cell); cx++)
      for (let cy = Math.floor(b.y0 / cell); cy <= Math.floor(b.y1 / cell); cy++)
        out.push(`${cx},${cy}`);
    return out;
  };
  const insert = (b: Box): void => {
    for (const k of cellsOf(b)) {
      const list = grid.get(k);
      if (list) list.push(b);
      else grid.set(k, [b]);
    }
  };
  const free = (b: Box, own: Box): boolean => {
    for (const k of cellsOf(b))
      for (const o of grid.get(k) ?? []) if (o !== own && overlaps(b, o)) return false;
    return true;
  };
  const dots = labels.map((l) => ({ x0: l.x - r, y0: l.y - r, x1: l.x + r, y1: l.y + r }));
  dots.forEach(insert);
  const bounds = opts.bounds;
  return labels.map((l, i) => {
    const { width: w, height: h } = l;
    for (const far of [1, 2.2]) {
      const d = (r + gap) * far;
      const candidates: [number, number][] = [
        [d, -h / 2],
        [-d - w, -h / 2],
        [-w / 2, -d - h],
        [-w / 2, d],
        [d * 0.7, -d * 0.7 - h],
        [d * 0.7, d * 0.7],
        [-d * 0.7 - w, -d * 0.7 - h],
        [-d * 0.7 - w, d * 0.7],
      ];
      for (const [dx, dy] of candidates) {
        const b = { x0: l.x + dx, y0: l.y + dy, x1: l.x + dx + w, y1: l.y + dy + h };
        if (
          bounds &&
          (b.x0 < bounds.x0 || b.y0 < bounds.y0 || b.x1 > bounds.x1 || b.y1 > bounds.y1)
        )
          continue;
        if (!free(b, dots[i])) continue;
        insert(b);
        return { dx, dy, leader: far > 1 };
      }
    }
    return null;
  });
}
