import { LitElement, css, html } from 'lit';
import { customElement, state } from 'lit/decorators.js';
import demo from '../../data/demo-plan.json';
import { CAUTION_TEXT, planDrop, validatePlan, type PlanResult } from '../core/index';

/** Application shell: plans the demo drop and lists the results per site. */
@customElement('seedfall-app')
export class SeedfallApp extends LitElement {
  static styles = css`
    :host {
      display: block;
      font-family: system-ui, sans-serif;
      color: #1d2a26;
      padding: 1rem;
    }
    .caution {
      background: #fff4d6;
      border-left: 4px solid #c98a00;
      padding: 0.5rem 0.75rem;
    }
    table {
      border-collapse: collapse;
    }
    th,
    td {
      padding: 0.2rem 0.6rem;
      text-align: right;
      border-bottom: 1px solid #d5ddd9;
    }
  `;

  @state() private result?: PlanResult;
  @state() private error?: string;

  connectedCallback(): void {
    super.connectedCallback();
    const v = validatePlan(demo);
    if (v.ok) this.result = planDrop(v.plan);
    else this.error = v.errors.map((e) => e.message).join('; ');
  }

  render() {
    const r = this.result;
    return html`
      <h1>Seedfall</h1>
      <p class="caution" role="note">${CAUTION_TEXT}</p>
      ${this.error ? html`<p role="alert">${this.error}</p>` : ''}
      ${
        r
          ? html`<h2>${r.name}</h2>
              <table>
                <thead>
                  <tr>
                    <th>Site</th>
                    <th>Variant</th>
                    <th>P(hit)</th>
                    <th>CEP m</th>
                    <th>Reachable</th>
                  </tr>
                </thead>
                <tbody>
                  ${r.sites.map(
                    (s) =>
                      html`<tr data-site=${s.id}>
                        <td>${s.id}</td>
                        <td>${s.variant}</td>
                        <td>${s.pHit.toFixed(2)}</td>
                        <td>${s.cep_m.toFixed(1)}</td>
                        <td>${s.reachable ? 'yes' : 'no'}</td>
                      </tr>`,
                  )}
                </tbody>
              </table>`
          : ''
      }
    `;
  }
}
