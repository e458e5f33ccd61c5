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
  .site-label {
    position: absolute;
    left: 16px;
    top: -3px;
    font:
      600 12px system-ui,
      sans-serif;
    color: #1c2b27;
    text-shadow:
      0 0 3px #fff,
      0 0 3px #fff,
      0 0 2px #fff;
    white-space: nowrap;
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
