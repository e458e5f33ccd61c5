/** The one marker drag at a time on the map; while it lasts, store updates leave markers alone. */
import type L from 'leaflet';

/** What a marker does while dragged: `start` once it is picked up, `move` on every step. */
export interface DragSteps {
  start?: () => void;
  move: () => void;
}

/** Tracks whether a marker is being dragged; `ended` runs when it is let go (commit, redraw). */
export class MarkerDrag {
  /** A marker is being dragged now. */
  active = false;

  constructor(private readonly ended: () => void) {}

  /** Wires a marker's drag events to the steps and to this drag's state. */
  wire(marker: L.Marker, steps: DragSteps): void {
    marker.on('dragstart', () => {
      this.active = true;
      steps.start?.();
    });
    marker.on('drag', () => steps.move());
    marker.on('dragend', () => {
      this.active = false;
      this.ended();
    });
  }
}
