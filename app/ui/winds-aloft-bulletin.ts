// The winds-aloft text section of <sf-wind-sources>: paste a bulletin, decode it, use a station.
import { html } from 'lit';
import { decodeWindsAloft, stationLayers, type WindsAloft } from '../formats';
import { applyWindLayers } from './apply-wind-layers';
import type { WindSourcesHost } from './wind-sources-host';

/** The pasted bulletin, what it decoded to and the station chosen; renders its section. */
export class WindsAloftBulletin {
  private bulletin = '';
  private decoded: WindsAloft | null = null;
  private station = '';

  constructor(private readonly host: WindSourcesHost) {}

  private readonly decode = (): void => {
    this.decoded = decodeWindsAloft(this.bulletin);
    this.host.problems = [
      ...this.decoded.problems,
      ...this.decoded.stations.flatMap((s) => s.problems.map((p) => `${s.id}: ${p}`)),
    ];
    this.station = this.decoded.stations[0]?.id ?? '';
    this.host.requestUpdate();
  };

  private readonly useStation = (): void => {
    const s = this.host.store;
    if (!s || !this.decoded || !this.station) return;
    const r = stationLayers(this.decoded, this.station, {
      groundElevation_m: Number(s.get('groundElevation_m')) || 0,
      reference: 'MSL',
    });
    this.host.problems = r.problems;
    if (r.layers.length === 0) {
      s.setNotice('error', `Station ${this.station}: no layers above the ground.`);
      return;
    }
    applyWindLayers(s, 'MSL', r.layers, r.temperatures, `Winds aloft ${this.station}`, r.notUsed);
  };

  render() {
    return html`<section>
      <h3>Winds-aloft text forecast</h3>
      <textarea
        data-testid="bulletin"
        aria-label="Winds-aloft bulletin text"
        placeholder="Paste the bulletin: the FT level line and the station lines"
        .value=${this.bulletin}
        @input=${(e: Event) => {
          this.bulletin = (e.target as HTMLTextAreaElement).value;
          this.host.requestUpdate();
        }}
      ></textarea>
      <div class="row">
        <button @click=${this.decode}>Decode</button>
        ${
          this.decoded?.stations.length
            ? html`<label
                  >Station
                  <select
                    data-testid="station"
                    @change=${(e: Event) => {
                      this.station = (e.target as HTMLSelectElement).value;
                      this.host.requestUpdate();
                    }}
                  >
                    ${this.decoded.stations.map((st) => html`<option ?selected=${st.id === this.station}>${st.id}</option>`)}
                  </select></label
                >
                <button @click=${this.useStation}>Use this station’s winds</button>`
            : ''
        }
      </div>
    </section>`;
  }
}
