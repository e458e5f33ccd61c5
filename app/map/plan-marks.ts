/** The plan's own marks on the map: the sites, the release point, the carrier track, its handle. */
import L from 'leaflet';

/** A site's marker icon; its id comes from a file, so the label is a text node, never HTML. */
export function siteIcon(label: string, bad: boolean): L.DivIcon {
  // The label sits inside the dot, which is not positioned, so it is still placed against the
  // icon box.
  const dot = document.createElement('div');
  dot.className = bad ? 'site-dot bad' : 'site-dot';
  const text = document.createElement('span');
  text.className = 'site-label';
  text.textContent = label;
  // A short line from the dot to its label when the label had to move away (site-markers.ts).
  const leader = document.createElement('span');
  leader.className = 'site-leader';
  dot.append(leader, text);
  return L.divIcon({ className: `sf-site-icon sf-site`, html: dot, iconSize: [14, 14] });
}

/**
 * A draggable site marker at [lat, lon] (degrees). No mark is a tab stop: the map is the one
 * focusable element, and its keys act on the selected site (ui/map-keys.ts).
 */
export function siteMarker(at: L.LatLngTuple, label: string, bad: boolean): L.Marker {
  return L.marker(at, {
    draggable: true,
    keyboard: false,
    riseOnHover: true,
    icon: siteIcon(label, bad),
  });
}

/** A draggable square mark: the icon box has the classes `className`, its one child `mark`. */
function dragMark(
  at: L.LatLngExpression,
  opts: { className: string; mark: string; size_px: number; title: string; zIndexOffset: number },
): L.Marker {
  return L.marker(at, {
    draggable: true,
    keyboard: false,
    title: opts.title,
    icon: L.divIcon({
      className: opts.className,
      html: `<div class="${opts.mark}"></div>`,
      iconSize: [opts.size_px, opts.size_px],
    }),
    zIndexOffset: opts.zIndexOffset,
  });
}

/** The release point's marker (a diamond above every other mark). */
export function releaseMarker(at: L.LatLngTuple): L.Marker {
  return dragMark(at, {
    className: 'sf-release-icon sf-release',
    mark: 'release-mark',
    size_px: 20,
    title: 'Release point (drag to move)',
    zIndexOffset: 1000,
  });
}

/** The carrier track handle, placed `handleSeconds` (s) of flight along the track. */
export function trackHandleMarker(at: L.LatLngTuple, handleSeconds: number): L.Marker {
  return dragMark(at, {
    className: 'sf-handle-icon sf-track-handle',
    mark: 'handle-mark',
    size_px: 14,
    title: `Carrier track handle: drag to set the track; its distance is ${handleSeconds} s of flight`,
    zIndexOffset: 900,
  });
}

/** The carrier track through the release point, as a dashed line that takes no clicks. */
export function trackLine(line: L.LatLngTuple[]): L.Polyline {
  return L.polyline(line, {
    color: '#1c2b27',
    weight: 1.5,
    dashArray: '10 6',
    className: 'sf-track',
    interactive: false,
  });
}
