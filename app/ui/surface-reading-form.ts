// The surface reading section of <sf-wind-sources>: one measured wind extended to the lowest layer.
import { html } from 'lit';
import { TERRAIN, type TerrainClass, type WindLayer } from '../model';
import { blendSurfaceReading, rangeProblem } from '../formats';
import { fromDisplaySpeed, parseNumber } from './units';
import type { WindSourcesHost } from './wind-sources-host';

type Reading = { height: string; speed: string; from: string };

/** The reading as typed, the terrain and the profile law; renders its section. */
export class SurfaceReadingForm {
  private reading: Reading = { height: '2', speed: '', from: '' };
  private terrain: TerrainClass = 'open';
  private law: 'log' | 'power' = 'log';

  constructor(private readonly host: WindSourcesHost) {}

  private readonly blend = (): void => {
    const s = this.host.store;
    if (!s) return;
    const h = parseNumber(this.reading.height);
    const v = parseNumber(this.reading.speed);
    const d = parseNumber(this.reading.from);
    const bad: string[] = [];
    if (!h.ok || h.value <= 0 || h.value > 100)
      bad.push('reading height must be a number between 0 and 100 m');
    const speed = v.ok ? fromDisplaySpeed(v.value, s.settings.units.speed) : NaN;
    // Speed and direction become plan wind layers: the plan schema's ranges apply.
    if (!v.ok) bad.push('reading speed must be a number');
    else {
      const p = rangeProblem('winds.layers[].speed_mps', speed);
      if (p) bad.push(`reading ${p}`);
    }
    if (!d.ok) bad.push('reading direction must be a number');
    else {
      const p = rangeProblem('winds.layers[].fromDeg', d.value);
      if (p) bad.push(`reading ${p}`);
    }
    if (bad.length || !h.ok || !v.ok || !d.ok) {
      this.host.problems = bad;
      return;
    }
    const layers = s.list<WindLayer>('winds.layers').slice();
    const ref = String(s.get('winds.reference') ?? 'AGL');
    const ground = Number(s.get('groundElevation_m')) || 0;
    // The surface profile is above ground; compare in the plan's reference.
    const agl = layers.map((l) => ({
      ...l,
      altitude_m: ref === 'MSL' ? l.altitude_m - ground : l.altitude_m,
    }));
    const lowest = agl.length ? Math.min(...agl.map((l) => l.altitude_m)) : 100;
    const r = blendSurfaceReading(
      agl,
      { height_m: h.value, speed_mps: speed, fromDeg: d.value },
      { law: this.law, terrain: this.terrain, upTo_m: Math.max(lowest, h.value + 1) },
    );
    this.host.problems = r.problems;
    if (!r.added) {
      s.setNotice('error', `Surface reading not used: ${r.problems[0] ?? 'no layers'}.`);
      return;
    }
    const merged = r.layers.map((l) => ({
      ...l,
      altitude_m: ref === 'MSL' ? l.altitude_m + ground : l.altitude_m,
    }));
    s.edit('winds.layers', merged);
    s.setNotice(
      'info',
      `Surface reading extended to ${Math.round(lowest)} m with the ${this.law} law over ${TERRAIN[this.terrain].label}` +
        (r.problems.length ? `; ${r.problems.join('; ')}.` : '.'),
    );
  };

  /** One typed part of the reading. */
  private input(caption: string, name: string, key: keyof Reading) {
    return html`<label
      >${caption}
      <input
        aria-label=${name}
        .value=${this.reading[key]}
        @input=${(e: Event) => {
          this.reading = { ...this.reading, [key]: (e.target as HTMLInputElement).value };
          this.host.requestUpdate();
        }}
    /></label>`;
  }

  render(speedUnit: string) {
    return html`<section>
      <h3>Surface reading</h3>
      <div class="row">
        ${this.input('Height m', 'Reading height, m', 'height')}
        ${this.input(`Speed ${speedUnit}`, 'Reading speed', 'speed')}
        ${this.input('From °', 'Reading direction from', 'from')}
      </div>
      <div class="row">
        <label
          >Terrain
          <select
            @change=${(e: Event) => {
              this.terrain = (e.target as HTMLSelectElement).value as TerrainClass;
              this.host.requestUpdate();
            }}
          >
            ${(Object.keys(TERRAIN) as TerrainClass[]).map(
              (k) =>
                html`<option value=${k} ?selected=${k === this.terrain}>
                  ${TERRAIN[k].label} (z0 ${TERRAIN[k].z0_m} m, α ${TERRAIN[k].alpha.toFixed(2)})
                </option>`,
            )}
          </select></label
        >
        <label
          >Law
          <select
            @change=${(e: Event) => {
              this.law = (e.target as HTMLSelectElement).value as 'log' | 'power';
              this.host.requestUpdate();
            }}
          >
            <option value="log" ?selected=${this.law === 'log'}>logarithmic</option>
            <option value="power" ?selected=${this.law === 'power'}>power</option>
          </select></label
        >
        <button @click=${this.blend}>Extend to the lowest layer</button>
      </div>
    </section>`;
  }
}
