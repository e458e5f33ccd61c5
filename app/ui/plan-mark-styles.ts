/** The look of map/plan-marks.ts's marks: site dots and labels, release diamond, track handle. */
import { css } from 'lit';

export const planMarkStyles = css`
  .sf-site-icon,
  .sf-release-icon,
  .sf-handle-icon {
    background: none;
    border: none;
  }
  .site-dot {
    width: 14px;
    height: 14px;
    border-radius: 50%;
    background: #fff;
    border: 3px solid #1a7f37;
    box-sizing: border-box;
    box-shadow: 0 0 0 1px #fff;
  }
  .site-dot.bad {
    border-color: #b42318;
  }
  .sf-site.selected .site-dot {
    box-shadow:
      0 0 0 2px #fff,
      0 0 0 4px #1c2b27;
  }
  /* Placed by site-markers.ts (left, top); these are the place of a label with none. */
  .site-label {
    position: absolute;
    left: 17px;
    top: -1px;
    font:
      600 12px/15px system-ui,
      sans-serif;
    color: #1c2b27;
    text-shadow:
      0 0 3px #fff,
      0 0 3px #fff,
      0 0 2px #fff;
    white-space: nowrap;
  }
  .site-label.off {
    display: none;
  }
  .sf-site:hover .site-label.off,
  .sf-site.selected .site-label.off {
    display: block;
    background: rgb(255 255 255 / 85%);
  }
  .site-leader {
    display: none;
    position: absolute;
    left: 7px;
    top: 6.5px;
    height: 1px;
    background: #1c2b27;
    transform-origin: 0 50%;
  }
  /* A keyboard user sees which mark has the focus; a click leaves no rectangle. */
  .leaflet-marker-icon:focus {
    outline: none;
  }
  .leaflet-marker-icon:focus-visible {
    outline: 2px solid #0f766e;
    outline-offset: 2px;
  }
  .release-mark {
    width: 20px;
    height: 20px;
    transform: rotate(45deg);
    background: #1c2b27;
    border: 3px solid #fff;
    box-sizing: border-box;
    box-shadow: 0 0 0 1px #1c2b27;
  }
  .handle-mark {
    width: 14px;
    height: 14px;
    border-radius: 3px;
    background: #fff;
    border: 3px solid #1c2b27;
    box-sizing: border-box;
  }
`;
