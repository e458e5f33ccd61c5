/** Release point and carrier track on the map: drag the release, or the handle to set the track. */
import type L from 'leaflet';
import { bearingDeg, distance_m } from '../model';
import {
  bearingHandle,
  releaseMarker,
  tipNode,
  trackHandleMarker,
  trackLine,
  trackSegment,
} from '../map';
import { dragPointTo, finite, shownPosition } from './map-position';
import type { MarkerDrag } from './marker-drag';
import type { PlanStore } from './plan-store';
import { formatCoord } from './units';

/** The track handle sits where the carrier will be this many seconds after the release point. */
const HANDLE_SECONDS = 10;
/** Handle movement toward or away from the release point (m) that still counts as turning only. */
const HANDLE_SLACK_M = 10;

/**
 * Carrier ground speed (m/s) set by a handle dragged to d_m from the release point, having been
 * startDist_m away when picked up: turning the handle keeps the old speed; pulling it in or out by
 * more than HANDLE_SLACK_M sets the speed (distance = HANDLE_SECONDS of flight; under 20 m is a
 * hover).
 */
function handleSpeed_mps(d_m: number, startDist_m: number, oldSpeed_mps: number): number {
  if (Math.abs(d_m - startDist_m) <= HANDLE_SLACK_M) return oldSpeed_mps;
  return d_m < 20 ? 0 : Math.round((d_m / HANDLE_SECONDS) * 10) / 10;
}

/** The release marker, the track line and its handle, kept in line with the plan store. */
export class ReleaseTrack {
  private release?: L.Marker;
  private handle?: L.Marker;
  private line?: L.Polyline;

  constructor(
    private readonly store: () => PlanStore,
    private readonly drag: MarkerDrag,
  ) {}

  /** Places the release marker (with its tooltip), the track and the handle from the store. */
  sync(map: L.Map): void {
    const s = this.store();
    const rp = shownPosition(s, 'release');
    if (!rp) return;
    const { lat, lon } = rp;
    const trackDeg = finite(s.get('carrier.trackDeg')) ?? 0;
    const speed = finite(s.get('carrier.groundSpeed_mps')) ?? 0;
    if (!this.release) {
      const marker = releaseMarker([lat, lon]).addTo(map);
      this.release = marker;
      this.drag.wire(marker, {
        move: () => {
          dragPointTo(this.store(), 'release', marker.getLatLng());
          this.place(map);
        },
      });
    } else {
      this.release.setLatLng([lat, lon]);
    }
    this.release
      .unbindTooltip()
      .bindTooltip(
        tipNode([
          `Release point · ${formatCoord(rp, s.settings.units.coords)}`,
          speed > 0
            ? `carrier ${speed.toFixed(1)} m/s on ${Math.round(trackDeg)}° true`
            : 'carrier hovering',
        ]),
      );
    this.place(map);
  }

  /** Track line and handle from the current draft. */
  private place(map: L.Map): void {
    const s = this.store();
    const rp = shownPosition(s, 'release');
    if (!rp) return;
    const trackDeg = finite(s.get('carrier.trackDeg')) ?? 0;
    const speed = finite(s.get('carrier.groundSpeed_mps')) ?? 0;
    const len = Math.max(40, speed * HANDLE_SECONDS);
    const reach = Math.max(400, speed * 40);
    const line = trackSegment(rp, trackDeg, 1, -reach, reach);
    if (!this.line) this.line = trackLine(line).addTo(map);
    else this.line.setLatLngs(line);
    const hp = bearingHandle(rp, trackDeg, len);
    if (!this.handle) {
      this.handle = trackHandleMarker(hp, HANDLE_SECONDS).addTo(map);
      this.wireHandle(this.handle);
    } else if (!this.drag.active) this.handle.setLatLng(hp);
  }

  /** Dragging the handle sets the carrier's track (and, pulled in or out, its speed). */
  private wireHandle(handle: L.Marker): void {
    let startDist = 0;
    const releaseNow = () => ({
      lat: finite(this.store().get('release.lat')) ?? 0,
      lon: finite(this.store().get('release.lon')) ?? 0,
    });
    const handleNow = () => {
      const p = handle.getLatLng();
      return { lat: p.lat, lon: p.lng };
    };
    this.drag.wire(handle, {
      start: () => {
        startDist = distance_m(releaseNow(), handleNow());
      },
      move: () => {
        const st = this.store();
        const r = releaseNow();
        const h = handleNow();
        const carrier = (st.get('carrier') as Record<string, unknown>) ?? {};
        const oldSpeed = finite(carrier.groundSpeed_mps) ?? 0;
        st.edit(
          'carrier',
          {
            ...carrier,
            trackDeg: (Math.round(bearingDeg(r, h) * 10) / 10) % 360,
            groundSpeed_mps: handleSpeed_mps(distance_m(r, h), startDist, oldSpeed),
          },
          { transient: true },
        );
        this.line?.setLatLngs(trackSegment(r, bearingDeg(r, h), 1, -400, 400));
      },
    });
  }
}
