import { LitElement, css, html } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { CAUTION_TEXT } from '../brief';
import { type ChecklistItem, type NoDropZone, planFingerprint } from '../plan';
import { blockingText, checklistOf, DEFAULT_MANUAL_ITEMS } from '../safety';
import type { PlanStore } from './plan-store';
import { sharedStyles } from './shared-styles';
import { StoreController } from './store-controller';
import { numberField } from './sf-number-field';

/** Corners of a stored zone's outer ring (0 when the zone has no ring to count). */
function corners(z: Partial<NoDropZone>): number {
  const ring = (z.geometry as { coordinates?: unknown } | undefined)?.coordinates;
  return Array.isArray(ring) && Array.isArray(ring[0]) ? Math.max(0, ring[0].length - 1) : 0;
}

const STATE_LABEL: Record<string, string> = {
  pass: 'pass',
  fail: 'FAIL',
  warn: 'warn',
  'n/a': 'n/a',
};

/**
 * The safety checklist: automatic checks computed with every plan, the crew's own items with who
 * and when, no-drop zones, and the ready sign-off (a failing check needs a written reason).
 */
@customElement('sf-safety-panel')
export class SfSafetyPanel extends LitElement {
  static styles = [
    sharedStyles,
    css`
      :host {
        display: block;
      }
      .state {
        padding: 8px 10px;
        border-radius: 6px;
        font-weight: 700;
        margin: 6px 0;
      }
      .ready {
        background: #e7f5ec;
        color: var(--sf-good);
        border: 1px solid #9fd3b0;
      }
      .not-ready {
        background: #fdecea;
        color: var(--sf-bad);
        border: 1px solid #f1b5ae;
      }
      .state ul {
        margin: 4px 0 0 18px;
        padding: 0;
        font-weight: 400;
      }
      .check {
        display: grid;
        grid-template-columns: 3.6em 1fr;
        gap: 6px;
        padding: 4px 0;
        border-bottom: 1px solid var(--sf-line);
      }
      .badge {
        font-weight: 700;
        font-size: 12px;
        text-align: center;
        border-radius: 4px;
        padding: 1px 0;
        height: fit-content;
      }
      .b-pass {
        background: #e7f5ec;
        color: var(--sf-good);
      }
      .b-fail {
        background: #fdecea;
        color: var(--sf-bad);
      }
      .b-warn {
        background: #fff4d6;
        color: #8a5a00;
      }
      .b-na {
        background: #eef1f0;
        color: var(--sf-muted);
      }
      details summary {
        cursor: pointer;
        font-size: 12px;
        color: var(--sf-muted);
      }
      .nums {
        font-size: 12px;
        font-variant-numeric: tabular-nums;
      }
      .item {
        display: grid;
        grid-template-columns: 6.5em 1fr;
        gap: 4px 8px;
        padding: 6px 0;
        border-bottom: 1px solid var(--sf-line);
      }
      .item .meta {
        grid-column: 2;
        display: flex;
        gap: 6px;
        flex-wrap: wrap;
      }
      .item input.text {
        width: 100%;
      }
      .item .meta input {
        width: 9em;
      }
      .caution {
        background: var(--sf-warn-bg);
        border-left: 4px solid var(--sf-warn-line);
        padding: 6px 8px;
        font-size: 13px;
      }
      .signoff {
        display: grid;
        gap: 4px;
        margin-top: 6px;
      }
      textarea {
        font: inherit;
        width: 100%;
        min-height: 3em;
      }
      .row {
        display: flex;
        gap: 6px;
        flex-wrap: wrap;
        align-items: center;
        margin-top: 6px;
      }
    `,
  ];

  @property({ attribute: false }) store?: PlanStore;
  @state() private signer = '';
  @state() private reason = '';
  @state() private signError = '';

  constructor() {
    super();
    new StoreController(this, () => this.store);
  }

  /**
   * The crew items as stored (entries of any kind, so an edit keeps the others as they were), or
   * the plan's template when the plan has none.
   */
  private checklistRaw(): unknown[] {
    const s = this.store;
    if (Array.isArray(s?.get('safety.checklist'))) return s!.list('safety.checklist');
    return s?.plan ? checklistOf(s.plan) : DEFAULT_MANUAL_ITEMS.map((m) => ({ ...m }));
  }

  /** The crew items to show: an entry that is not an item shows as an empty one. */
  private checklist(): Partial<ChecklistItem>[] {
    return this.checklistRaw().map((m) =>
      m !== null && typeof m === 'object' && !Array.isArray(m) ? (m as Partial<ChecklistItem>) : {},
    );
  }

  private setChecklist(items: unknown[]): void {
    this.store?.edit('safety.checklist', items);
  }

  private setItem(i: number, patch: Partial<ChecklistItem>): void {
    const view = this.checklist();
    const items = this.checklistRaw().map((m, j) => (j === i ? { ...view[j], ...patch } : m));
    this.setChecklist(items);
  }

  private setState(i: number, state: ChecklistItem['state']): void {
    const cur = this.checklist()[i] ?? {};
    const who = (typeof cur.who === 'string' && cur.who) || this.signer || undefined;
    this.setItem(i, {
      state,
      who,
      when: state === 'open' ? undefined : new Date().toISOString().slice(0, 16),
    });
  }

  private addItem(): void {
    const items = this.checklist();
    let n = items.length + 1;
    while (items.some((m) => m.id === `item-${n}`)) n++;
    this.setChecklist([
      ...this.checklistRaw(),
      { id: `item-${n}`, text: 'New item', state: 'open' },
    ]);
  }

  private signOff(): void {
    const s = this.store;
    const safety = s?.safety;
    if (!s || !safety || !s.plan) return;
    if (!s.current) {
      this.signError =
        'Planning is still running for the latest edits: sign off once the checks are up to date.';
      return;
    }
    const who = this.signer.trim();
    if (!who) {
      this.signError = 'Enter your name to sign the plan off.';
      return;
    }
    const failing = safety.checks.filter((c) => c.status === 'fail');
    if (failing.length > 0 && !this.reason.trim()) {
      this.signError = `${failing.length} automatic check(s) fail: write the reason for going ahead.`;
      return;
    }
    if (safety.checklist.some((m) => m.state === 'open')) {
      this.signError = 'Every crew item must be done or marked not applicable first.';
      return;
    }
    this.signError = '';
    s.edit('safety.signoff', {
      who,
      when: new Date().toISOString().slice(0, 16),
      planHash: planFingerprint(s.plan),
      ...(failing.length > 0
        ? { reason: this.reason.trim(), covers: failing.map((c) => c.id) }
        : {}),
    });
  }

  private renderChecks() {
    const safety = this.store?.safety;
    if (!safety) return html`<p class="muted">Checks run with the next planning result…</p>`;
    return safety.checks.map(
      (c) =>
        html`<div class="check" data-check=${c.id} data-status=${c.status}>
          <span class=${`badge b-${c.status === 'n/a' ? 'na' : c.status}`}
            >${STATE_LABEL[c.status]}</span
          >
          <div>
            <b>${c.title}</b><br />${c.why}
            ${
              Object.keys(c.numbers).length
                ? html`<details>
                    <summary>Figures</summary>
                    <div class="nums">
                      ${Object.entries(c.numbers).map(([k, v]) => html`<div>${k}: ${String(v)}</div>`)}
                    </div>
                  </details>`
                : ''
            }
          </div>
        </div>`,
    );
  }

  private renderState() {
    const safety = this.store?.safety;
    if (!safety) return '';
    if (safety.signedReady) {
      const so = safety.signoff!;
      return html`<div class="state ready" data-testid="safety-state">
        READY — signed off by ${so.who} at ${so.when}
        ${
          so.reason
            ? html`<ul>
                <li>Going ahead despite failing checks: ${so.reason}</li>
              </ul>`
            : ''
        }
        <div class="row">
          <button @click=${() => this.store?.edit('safety.signoff', undefined)}>
            Withdraw sign-off
          </button>
        </div>
      </div>`;
    }
    const blocking = blockingText(safety);
    return html`<div class="state not-ready" data-testid="safety-state">
      NOT READY
      <ul>
        ${blocking.map((b) => html`<li>${b}</li>`)}
        ${
          safety.signoff && !safety.signoffCurrent
            ? html`<li>
                the sign-off by ${safety.signoff.who} was for an earlier version of the plan
              </li>`
            : safety.signoff
              ? ''
              : html`<li>not signed off</li>`
        }
      </ul>
    </div>`;
  }

  private renderZones() {
    const s = this.store!;
    const zones = s.rows<NoDropZone>('safety.noDropZones');
    return html`<h3>No-drop zones (${zones.length})</h3>
      <p class="muted">
        Roads, buildings, water, gatherings: nothing may land within the buffer of these. Draw them
        on the map (“Draw no-drop zone”) or open a GeoJSON file of polygons.
      </p>
      ${zones.map(
        (z, i) =>
          html`<div class="row" data-zone=${i}>
            <input
              aria-label=${`No-drop zone ${i + 1} name`}
              .value=${String(z.properties?.name ?? '')}
              @change=${(e: Event) => s.edit(`safety.noDropZones[${i}].properties`, { name: (e.target as HTMLInputElement).value })}
            />
            <span class="muted">${corners(z)} corners</span>
            <button
              aria-label=${`Delete no-drop zone ${i + 1}`}
              @click=${() =>
                s.edit(
                  'safety.noDropZones',
                  s.list('safety.noDropZones').filter((_, j) => j !== i),
                )}
            >
              ✕
            </button>
          </div>`,
      )}
      <div class="row">
        <label
          >Open GeoJSON polygons
          <input
            type="file"
            accept=".geojson,.json,application/geo+json"
            data-testid="zones-file"
            @change=${this.importZones}
          />
        </label>
      </div>`;
  }

  private async importZones(e: Event): Promise<void> {
    const s = this.store!;
    const input = e.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    let data: unknown;
    try {
      data = JSON.parse(await file.text());
    } catch {
      s.setNotice('error', `${file.name}: not JSON; no zones added.`);
      return;
    }
    const obj = (v: unknown): Record<string, unknown> =>
      v !== null && typeof v === 'object' && !Array.isArray(v)
        ? (v as Record<string, unknown>)
        : {};
    const top = obj(data);
    const feats: unknown[] =
      top.type === 'FeatureCollection' ? (Array.isArray(top.features) ? top.features : []) : [data];
    const zones: NoDropZone[] = [];
    const skipped: string[] = [];
    feats.forEach((f, i) => {
      const g = (obj(f).geometry ?? obj(f)) as {
        type?: unknown;
        coordinates?: number[][][] | number[][][][];
      };
      const pname = obj(obj(f).properties).name;
      const name = typeof pname === 'string' ? pname : `${file.name} ${i + 1}`;
      if (g?.type === 'Polygon')
        zones.push({
          type: 'Feature',
          properties: { name },
          geometry: { type: 'Polygon', coordinates: g.coordinates as number[][][] },
        });
      else if (g?.type === 'MultiPolygon' && Array.isArray(g.coordinates)) {
        (g.coordinates as number[][][][]).forEach((c, k) =>
          zones.push({
            type: 'Feature',
            properties: { name: `${name} ${k + 1}` },
            geometry: { type: 'Polygon', coordinates: c },
          }),
        );
      } else
        skipped.push(`features[${i}] (${typeof g?.type === 'string' ? g.type : 'no geometry'})`);
    });
    const cur = s.list('safety.noDropZones');
    s.edit('safety.noDropZones', [...cur, ...zones]);
    s.setNotice(
      skipped.length ? 'error' : 'info',
      `${file.name}: ${zones.length} zone(s) added${skipped.length ? `; not polygons, skipped: ${skipped.join(', ')}` : ''}.`,
    );
  }

  render() {
    const s = this.store;
    if (!s) return html``;
    const items = this.checklist();
    const n = (
      path: string,
      label: string,
      unit: string,
      def: string,
      kind: 'length' | 'plain' = 'length',
    ) =>
      numberField(s, path, label, { kind, unit, optional: true, placeholder: `${def} (default)` });
    return html`
      <p class="caution" role="note">${CAUTION_TEXT}</p>
      ${this.renderState()}
      <h3>Automatic checks</h3>
      ${this.renderChecks()}
      <h3>Crew checklist</h3>
      ${items.map(
        (m, i) =>
          html`<div class="item" data-item=${String(m.id ?? '')}>
            <select
              aria-label=${`State of: ${m.text}`}
              @change=${(e: Event) => this.setState(i, (e.target as HTMLSelectElement).value as ChecklistItem['state'])}
            >
              ${(['open', 'done', 'n/a'] as const).map((st) => html`<option value=${st} ?selected=${m.state === st}>${st}</option>`)}
            </select>
            <input
              class="text"
              aria-label=${`Checklist item ${i + 1}`}
              .value=${String(m.text ?? '')}
              @change=${(e: Event) => this.setItem(i, { text: (e.target as HTMLInputElement).value || String(m.text ?? '') })}
            />
            <div class="meta">
              <input
                aria-label=${`Who, item ${i + 1}`}
                placeholder="who"
                .value=${String(m.who ?? '')}
                @change=${(e: Event) => this.setItem(i, { who: (e.target as HTMLInputElement).value || undefined })}
              />
              <span class="muted">${String(m.when ?? '')}</span>
              <input
                aria-label=${`Note, item ${i + 1}`}
                placeholder="note"
                .value=${String(m.note ?? '')}
                @change=${(e: Event) => this.setItem(i, { note: (e.target as HTMLInputElement).value || undefined })}
              />
              <button
                aria-label=${`Delete item ${i + 1}`}
                title="Delete this item"
                @click=${() => this.setChecklist(this.checklistRaw().filter((_, j) => j !== i))}
              >
                ✕
              </button>
            </div>
          </div>`,
      )}
      <div class="row">
        <button @click=${this.addItem}>Add item</button>
        <button @click=${() => this.setChecklist(DEFAULT_MANUAL_ITEMS.map((m) => ({ ...m })))}>
          Reset to template
        </button>
      </div>
      <h3>Sign-off</h3>
      <div class="signoff">
        <label
          >Your name
          <input
            data-testid="signer"
            .value=${this.signer}
            @input=${(e: Event) => (this.signer = (e.target as HTMLInputElement).value)}
        /></label>
        <label
          >Reason for going ahead despite failing checks (recorded with your name and time)
          <textarea
            data-testid="override-reason"
            .value=${this.reason}
            @input=${(e: Event) => (this.reason = (e.target as HTMLTextAreaElement).value)}
          ></textarea>
        </label>
        <div class="row">
          <button @click=${this.signOff}>Mark ready</button>
          ${this.signError ? html`<span class="field-error" role="alert">${this.signError}</span>` : ''}
        </div>
      </div>
      <h3>Settings (match local rules)</h3>
      ${n('safety.ceiling_m', 'Release ceiling above ground', '', '120 m')}
      ${n('safety.noDropBuffer_m', 'Clearance from no-drop zones', '', '10 m')}
      ${n('safety.hazardBuffer_m', 'Margin around the hazard area', '', '20 m')}
      ${n('safety.thrustMargin_pct', 'Control time kept in reserve', '%', '20', 'plain')}
      ${this.renderZones()}
    `;
  }
}
