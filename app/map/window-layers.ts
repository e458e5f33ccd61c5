/**
 * Release windows on the map. Every window lies on the one carrier track, so each is drawn in
 * its own lane beside the track (windows that overlap along the track never share a lane; lanes
 * alternate sides), with a tick across its lane where it opens and where it closes. The
 * selected site's windows are drawn on top, thicker, with ticks reaching back to the track and
 * their open and close times written beside them; the others fade while a site is selected.
 * Lanes are a fixed number of screen pixels apart, so the caller rebuilds them after a zoom.
 */
import L from 'leaflet';
import { includedText, type PlanResult, pHitText } from '../planner';
import { offsetLine, trackSegment } from './geometry';
import { laneSide, windowLanes } from './layout';
import { type LayerVisibility, shownResults, signedSeconds } from './plan-layers';
import { lazyTip, tipNode } from './tooltip';

/** Screen pixels between neighbouring lanes. */
const LANE_PX = 10;
/** Lanes before they are reused (a plan of hundreds of sites). */
const MAX_LANES = 12;

/** How the windows are drawn now. */
export interface WindowView {
  /** Metres per screen pixel at the release point (the current zoom). */
  metresPerPixel: number;
  /** The selected site's id, or null. */
  selected: string | null;
  /** The pane drawn in (above the other result shapes, so windows stay in reach). */
  pane?: string;
  /** Renderer for the unselected windows (a canvas of that pane, for big plans). */
  renderer?: L.Renderer;
}

/** The release windows of the shown variants, in lanes beside the track (class `sf-window`). */
export function buildWindowLayers(
  result: PlanResult,
  colour: (variantId: string) => string,
  vis: LayerVisibility,
  view: WindowView,
): L.LayerGroup {
  const group = L.layerGroup();
  const { track, releasePoint: rp } = result;
  if (!vis.kinds.window || !(track.groundSpeed_mps > 0)) return group;
  const items = result.sites.flatMap((site) =>
    shownResults(site, vis).flatMap((v) =>
      v.releaseWindow ? [{ site, v, w: v.releaseWindow }] : [],
    ),
  );
  const lanes = windowLanes(
    items.map((i) => i.w),
    MAX_LANES,
  );
  const included = includedText(result.errorSources);
  const lane_m = LANE_PX * view.metresPerPixel;
  const at = (t_s: number): [number, number] =>
    trackSegment(rp, track.trackDeg, track.groundSpeed_mps, t_s, t_s)[0];
  const selectedLast = items
    .map((item, i) => ({ ...item, lane: lanes[i] }))
    .sort((a, b) => Number(a.site.id === view.selected) - Number(b.site.id === view.selected));
  for (const { site, v, w, lane } of selectedLast) {
    const chosen = site.id === view.selected;
    const faded = view.selected !== null && !chosen;
    const c = colour(v.variant);
    const who = `${site.id} · ${v.variant}`;
    const off = laneSide(lane) * lane_m;
    const line = offsetLine(
      trackSegment(rp, track.trackDeg, track.groundSpeed_mps, w.open_s, w.close_s),
      track.trackDeg,
      off,
    );
    L.polyline(line, {
      color: c,
      weight: chosen ? 8 : 6,
      opacity: faded ? 0.3 : chosen ? 0.95 : 0.7,
      lineCap: 'butt',
      className: chosen ? 'sf-window sf-window-selected' : 'sf-window',
      renderer: chosen ? undefined : view.renderer,
      pane: view.pane,
    })
      .bindTooltip(
        lazyTip(
          `Release window · ${who}`,
          `opens ${signedSeconds(w.open_s)}, closes ${signedSeconds(w.close_s)} (relative to passing the release point)`,
          `best ${signedSeconds(w.best_s)} · P(hit) ${pHitText(v.pHit, v.pHitSE)}`,
          included,
        ),
        { sticky: true },
      )
      .addTo(group);
    const side = Math.sign(off) || 1;
    for (const [t, what] of [
      [w.open_s, 'opens'],
      [w.close_s, 'closes'],
    ] as const) {
      // A tick across the lane; the selected window's reach back to the track.
      const from = chosen ? 0 : off - side * lane_m * 0.6;
      const to = off + side * lane_m * 0.6;
      const p = at(t);
      const tick = L.polyline(
        [offsetLine([p], track.trackDeg, from)[0], offsetLine([p], track.trackDeg, to)[0]],
        {
          color: c,
          weight: 2,
          opacity: faded ? 0.35 : 1,
          className: chosen ? 'sf-window-tick sf-window-selected' : 'sf-window-tick',
          renderer: chosen ? undefined : view.renderer,
          pane: view.pane,
        },
      ).addTo(group);
      if (chosen) {
        // Only numbers: the time is safe as text, still handed over as a text node.
        tick.bindTooltip(tipNode([`${what} ${signedSeconds(t)}`]), {
          permanent: true,
          direction: side > 0 ? 'right' : 'left',
          className: 'sf-window-time',
          interactive: false,
        });
      } else tick.bindTooltip(lazyTip(`${who}: ${what} ${signedSeconds(t)}`));
    }
  }
  return group;
}
