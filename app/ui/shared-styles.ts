import { css } from 'lit';

/** Colours and form/table styles shared by the panels. */
export const sharedStyles = css`
  :host {
    --sf-ink: #1c2b27;
    --sf-muted: #5b6b66;
    --sf-line: #d3dcd8;
    --sf-panel: #f6f8f7;
    --sf-accent: #0f766e;
    --sf-bad: #b42318;
    /* 5.5:1 on the selected row's and the chosen column's tint (#dff0ea), over 4.5:1 for text. */
    --sf-good: #146c2e;
    --sf-warn-bg: #fff4d6;
    --sf-warn-line: #b7791f;
    color: var(--sf-ink);
    font:
      14px/1.35 system-ui,
      'DejaVu Sans',
      sans-serif;
  }
  h2 {
    font-size: 15px;
    margin: 0.8rem 0 0.4rem;
  }
  /* Section headings keep the case they are written in: a style that changes case would turn
     a symbol into another (σ, a standard deviation, into Σ, a sum). */
  h3 {
    font-size: 14px;
    font-weight: 600;
    margin: 0.9rem 0 0.35rem;
    padding-bottom: 2px;
    color: #24453e;
    border-bottom: 1px solid var(--sf-line);
  }
  table {
    border-collapse: collapse;
    width: 100%;
  }
  th,
  td {
    padding: 3px 4px;
    border-bottom: 1px solid var(--sf-line);
    text-align: left;
    vertical-align: top;
  }
  th {
    font-weight: 600;
    font-size: 12px;
    color: var(--sf-muted);
  }
  /* Widths include padding and border, so a control set to 100% stays inside its box. */
  input,
  select,
  textarea {
    box-sizing: border-box;
  }
  input,
  select {
    font: inherit;
    padding: 3px 5px;
    border: 1px solid #aab8b3;
    border-radius: 4px;
    background: #fff;
    color: inherit;
    min-width: 0;
  }
  textarea {
    max-width: 100%;
  }
  /* Whatever has the keyboard focus shows it: a 2 px ring in the accent (5.5:1 on white, over
     the 3:1 asked of a focus indicator), with a white halo inside so the ring stays visible on a
     dark or coloured background too. */
  :focus-visible {
    outline: 2px solid var(--sf-accent);
    outline-offset: 2px;
  }
  a:focus-visible,
  button:focus-visible,
  input:focus-visible,
  select:focus-visible,
  summary:focus-visible,
  textarea:focus-visible {
    box-shadow: 0 0 0 2px #fff;
  }
  input[aria-invalid='true'] {
    border-color: var(--sf-bad);
    background: #fff5f4;
  }
  button {
    font: inherit;
    padding: 4px 10px;
    border: 1px solid #8fa39c;
    border-radius: 4px;
    background: #fff;
    color: inherit;
    cursor: pointer;
  }
  button:hover:not(:disabled) {
    background: #eaf2ef;
  }
  button:disabled {
    opacity: 0.45;
    cursor: default;
  }
  .field-error {
    color: var(--sf-bad);
    font-size: 12px;
    margin-top: 2px;
    /* A message names its field by path ("sites[0].tolerance_m"): break it rather than overflow. */
    overflow-wrap: anywhere;
  }
  .muted {
    color: var(--sf-muted);
  }
  .num {
    text-align: right;
    font-variant-numeric: tabular-nums;
  }
`;

/** A loaded file's facts as a two-column definition list (the Terrain and base-map sections). */
export const factListStyles = css`
  dl {
    display: grid;
    grid-template-columns: max-content 1fr;
    gap: 2px 10px;
    margin: 6px 0;
    font-size: 13px;
  }
  dt {
    color: var(--sf-muted);
  }
  dd {
    margin: 0;
    overflow-wrap: anywhere;
  }
`;

/** Our own colours for vehicle variants, in catalogue order (repeats after the last). */
export const VARIANT_COLOURS = ['#0f766e', '#b45309', '#7c3aed', '#be123c', '#1d4ed8', '#4d7c0f'];
