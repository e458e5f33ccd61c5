/** Drawing a no-drop zone on the map: corners clicked one by one, then saved to the plan. */
import type L from 'leaflet';
import { drawingOutline } from '../map';
import type { PlanStore } from './plan-store';
import { planLatLon } from './map-position';

/** The zone being drawn (if any): its corners so far and their outline on the map. */
export class ZoneDrawing {
  /** Clicks on the map add corners. */
  active = false;
  corners: L.LatLng[] = [];
  private outline?: L.Polyline;

  /** `changed` asks the host to render again (the buttons show the drawing's state). */
  constructor(private readonly changed: () => void) {}

  start(): void {
    this.active = true;
    this.changed();
  }

  /** Stops drawing and drops the corners. */
  cancel(): void {
    this.active = false;
    this.corners = [];
    this.changed();
  }

  add(p: L.LatLng): void {
    this.corners = [...this.corners, p];
    this.changed();
  }

  /** Saves the zone (3 corners or more) to the no-drop zones as "Zone n"; stops drawing. */
  finish(store: PlanStore | undefined): void {
    if (store && this.corners.length >= 3) {
      const zones = store.list('safety.noDropZones');
      const ring = this.corners.map((p) => {
        const { lat, lon } = planLatLon(p);
        return [lon, lat];
      });
      ring.push([...ring[0]]);
      store.edit('safety.noDropZones', [
        ...zones,
        {
          type: 'Feature',
          properties: { name: `Zone ${zones.length + 1}` },
          geometry: { type: 'Polygon', coordinates: [ring] },
        },
      ]);
    }
    this.cancel();
  }

  /** What the draw button says. */
  get buttonText(): string {
    if (!this.active) return 'Draw no-drop zone';
    const n = this.corners.length;
    return n >= 3 ? `Finish zone (${n} corners)` : `Click ${3 - n} more corner(s)…`;
  }

  /** The zone being drawn, as a dashed outline through the clicked corners. */
  place(map: L.Map): void {
    if (!this.active || this.corners.length === 0) {
      this.outline?.remove();
      this.outline = undefined;
      return;
    }
    const ring = [...this.corners, this.corners[0]];
    if (!this.outline) this.outline = drawingOutline(ring).addTo(map);
    else this.outline.setLatLngs(ring);
  }
}
