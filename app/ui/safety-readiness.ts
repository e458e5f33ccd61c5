// The readiness banner and the automatic checks list of <sf-safety-panel>.
import { css, html } from 'lit';
import { blockingText } from '../safety';
import type { PlanStore } from './plan-store';

const STATE_LABEL: Record<string, string> = {
  pass: 'pass',
  fail: 'FAIL',
  warn: 'warn',
  'n/a': 'n/a',
};

/** Styles of the banner and the checks list. */
export const readinessStyles = css`
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
  .site-links {
    display: flex;
    flex-wrap: wrap;
    gap: 4px;
    margin: 3px 0;
  }
  .site-links details {
    flex-basis: 100%;
  }
  .site-link {
    font-size: 12px;
    padding: 0 6px;
    font-variant-numeric: tabular-nums;
  }
  .site-link[aria-pressed='true'] {
    border-color: var(--sf-accent);
    font-weight: 700;
  }
  .nums {
    font-size: 12px;
    font-variant-numeric: tabular-nums;
  }
`;

/** Site buttons shown before the rest fold away under "N more" (a plan may have 1,000 sites). */
const LINKS_SHOWN = 12;

/** Selects a site and asks the map to show it. */
function goTo(s: PlanStore, id: string): void {
  s.selectSite(id);
  s.focusSite(id);
}

/** The sites a check names, each a button that selects it and shows it on the map. */
function siteLinks(s: PlanStore, ids: readonly string[]) {
  if (ids.length === 0) return '';
  const link = (id: string) =>
    html`<button
      class="site-link"
      data-site=${id}
      aria-pressed=${s.selectedSite === id ? 'true' : 'false'}
      title=${`Select ${id} and show it on the map`}
      @click=${() => goTo(s, id)}
    >
      ${id}
    </button>`;
  const rest = ids.slice(LINKS_SHOWN);
  return html`<div class="site-links" role="group" aria-label="Sites this check names">
    ${ids.slice(0, LINKS_SHOWN).map(link)}
    ${
      rest.length
        ? html`<details>
            <summary>${rest.length} more</summary>
            ${rest.map(link)}
          </details>`
        : ''
    }
  </div>`;
}

/** Each automatic check with its status badge, its reason, the sites it names and its figures. */
export function checksList(s: PlanStore) {
  const safety = s.safety;
  if (!safety) return html`<p class="muted">Checks run with the next planning result…</p>`;
  return safety.checks.map(
    (c) =>
      html`<div class="check" data-check=${c.id} data-status=${c.status}>
        <span class=${`badge b-${c.status === 'n/a' ? 'na' : c.status}`}
          >${STATE_LABEL[c.status]}</span
        >
        <div>
          <b>${c.title}</b><br />${c.why} ${siteLinks(s, c.sites ?? [])}
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

/** READY with who signed and when (and a way to withdraw), or NOT READY with what blocks it. */
export function readinessState(s: PlanStore) {
  const safety = s.safety;
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
        <button @click=${() => s.edit('safety.signoff', undefined)}>Withdraw sign-off</button>
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
