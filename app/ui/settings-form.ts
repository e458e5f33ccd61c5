/** The settings tab: display units, the brief's paper, and the background map's tile source. */
import { html, type TemplateResult } from 'lit';
import './basemap-panel';
import type { PlanStore } from './plan-store';
import { PAPERS } from './saved-state';
import { COORD_FORMATS, LENGTH_UNITS, SPEED_UNITS, type UnitPrefs } from './units';

const COORD_NAMES: Record<UnitPrefs['coords'], string> = {
  decimal: 'decimal degrees',
  dms: 'degrees minutes seconds',
  utm: 'UTM',
  mgrs: 'MGRS',
};

/** One labelled list of choices (data-setting names it); pick gets the chosen value. */
function choice<T extends string>(
  label: string,
  setting: string,
  options: readonly T[],
  current: T,
  pick: (value: T) => void,
  name: (value: T) => string = (v) => v,
): TemplateResult {
  return html`<label
    >${label}
    <select
      data-setting=${setting}
      @change=${(e: Event) => pick((e.target as HTMLSelectElement).value as T)}
    >
      ${options.map((o) => html`<option value=${o} ?selected=${o === current}>${name(o)}</option>`)}
    </select></label
  >`;
}

/** The settings form; each change goes to the store, which checks and keeps it. */
export function renderSettings(s: PlanStore): TemplateResult {
  const st = s.settings;
  const setUnits = (patch: Partial<UnitPrefs>): void =>
    s.setSettings({ units: { ...s.settings.units, ...patch } });
  return html`<div class="settings">
    <h3>Units</h3>
    ${choice('Lengths and altitudes', 'length', LENGTH_UNITS, st.units.length, (length) => setUnits({ length }))}
    ${choice('Speeds', 'speed', SPEED_UNITS, st.units.speed, (speed) => setUnits({ speed }))}
    ${choice(
      'Coordinates',
      'coords',
      COORD_FORMATS,
      st.units.coords,
      (coords) => setUnits({ coords }),
      (u) => COORD_NAMES[u],
    )}
    <h3>Brief</h3>
    ${choice('Paper size', 'paper', PAPERS, st.paper, (paper) => s.setSettings({ paper }))}
    <h3>Background map</h3>
    <p class="muted">
      Without a tile source the map shows a coordinate grid and scale only, which is all planning
      needs. When online, give a tile URL template with {z}, {x}, {y} and its attribution; for the
      field, open a PMTiles archive or keep the plan area's tiles below.
    </p>
    <label
      >Tile URL template
      <input
        data-setting="tileUrl"
        .value=${st.tileUrl}
        placeholder="https://…/{z}/{x}/{y}.png"
        @change=${(e: Event) => s.setSettings({ tileUrl: (e.target as HTMLInputElement).value.trim() })}
    /></label>
    <label
      >Attribution
      <input
        data-setting="tileAttribution"
        .value=${st.tileAttribution}
        @change=${(e: Event) => s.setSettings({ tileAttribution: (e.target as HTMLInputElement).value })}
    /></label>
    <sf-basemap-panel .store=${s}></sf-basemap-panel>
  </div>`;
}
