/** What the app tells the person about its state: standing alerts and the status line. */
import { html, type TemplateResult } from 'lit';
import { downloadDamaged } from './downloads';
import type { PlanStore } from './plan-store';
import { renderAppUpdate } from './pwa-update';
import { DAMAGED_KEY } from './saved-state';
import { baseName } from './terrain-loader';

/** Warnings shown in full; the rest fold away under "N more" (a plan may give hundreds). */
const WARNINGS_SHOWN = 4;

/**
 * The plan's warnings as the crew must see them from every tab: the checks of the file (no time,
 * a crew item done with nobody named, …) and the planner's (wind layers that do not cover the
 * fall, …), each once.
 */
export function planWarnings(s: PlanStore): string[] {
  return [...new Set([...s.warnings, ...(s.result?.warnings ?? [])])];
}

/** Standing alerts that must not scroll away: a damaged saved draft, the plan's warnings, autosave failures. */
export function renderAlerts(s: PlanStore): TemplateResult[] {
  const d = s.damaged;
  const out: TemplateResult[] = [];
  if (d) {
    const what = d.earlier
      ? html`A saved draft that could not be read${d.at ? ` (found ${d.at})` : ''} is still kept in
        browser storage under ${DAMAGED_KEY}.`
      : html`Your saved draft could not be read: ${d.reason}. The app started on the demo plan
        instead.
        ${
          d.stored
            ? html`The damaged draft is kept unchanged in browser storage under ${DAMAGED_KEY} until
              you delete it.`
            : html`Browser storage cannot hold a copy of it, so autosave is paused and the damaged
              draft stays where it was until you download or discard it.`
        }`;
    out.push(
      html`<div class="alert" role="alert" data-testid="damaged-draft">
        <p>${what}</p>
        <button data-testid="download-damaged" @click=${() => downloadDamaged(s)}>
          Download damaged draft
        </button>
        ${
          d.stored
            ? html`<button data-testid="delete-damaged" @click=${() => s.deleteDamagedCopy()}>
                  Delete kept copy
                </button>
                <button data-testid="dismiss-damaged" @click=${() => s.dismissDamaged()}>
                  Dismiss
                </button>`
            : html`<button data-testid="dismiss-damaged" @click=${() => s.dismissDamaged()}>
                Discard it and resume autosave
              </button>`
        }
      </div>`,
    );
  }
  const warnings = planWarnings(s);
  if (warnings.length > 0) {
    const head = warnings.slice(0, WARNINGS_SHOWN);
    const rest = warnings.slice(WARNINGS_SHOWN);
    out.push(
      html`<div class="plan-warnings" role="status" data-testid="plan-warnings">
        ${
          warnings.length === 1
            ? html`<strong>Warning:</strong> ${warnings[0]}`
            : html`<strong>Warnings:</strong>
                <ul>
                  ${head.map((w) => html`<li>${w}</li>`)}
                </ul>`
        }
        ${
          rest.length
            ? html`<details>
                <summary>${rest.length} more</summary>
                <ul>
                  ${rest.map((w) => html`<li>${w}</li>`)}
                </ul>
              </details>`
            : ''
        }
      </div>`,
    );
  }
  if (s.saveError) {
    out.push(
      html`<div class="alert" role="alert" data-testid="save-error">
        <p>${s.saveError}.</p>
      </div>`,
    );
  }
  return out;
}

/** The status line: planning progress or time, the plan's problems, worker failures, the notice. */
export function renderStatus(s: PlanStore): TemplateResult[] {
  const parts: TemplateResult[] = [];
  if (s.computing) {
    parts.push(
      html`<span data-testid="computing"
        >Planning… <progress max="1" .value=${s.progress}></progress
      ></span>`,
    );
  } else if (s.result) {
    parts.push(
      html`<span data-testid="planned"
        >Planned ${s.result.sites.length} sites in ${Math.round(s.elapsed_ms)} ms.</span
      >`,
    );
  }
  if (s.terrainStatus.state === 'loading') {
    parts.push(
      html`<span data-testid="terrain-reading"
        >Reading elevation model ${s.terrainStatus.name}…</span
      >`,
    );
  }
  const named = s.plan?.terrain?.file;
  if (named && s.terrainStatus.state !== 'loading' && s.dem?.name !== baseName(named)) {
    // Another model may be in use (one kept in this browser, or opened before this plan).
    const over = s.dem ? `planned over ${s.dem.name} instead` : 'planned over flat ground';
    parts.push(
      html`<span class="notice-error" data-testid="terrain-missing"
        >The plan names the elevation model ${named}, which is not open here: ${over}. Open it under
        Release &amp; plan → Terrain.</span
      >`,
    );
  }
  if (!s.valid) {
    const n = s.issues.length + s.texts.size;
    parts.push(
      html`<span class="invalid" data-testid="stale" role="status">
        ${n} problem${n === 1 ? '' : 's'} in the plan — the map shows the last valid result.</span
      >`,
    );
  }
  if (s.workerError)
    parts.push(html`<span class="notice-error">Planning failed: ${s.workerError}</span>`);
  if (s.library.quotaWarning) {
    parts.push(
      html`<span class="notice-error" data-testid="quota-warning" role="status"
        >${s.library.quotaWarning}</span
      >`,
    );
  }
  if (s.notice) {
    parts.push(
      html`<span
        class=${s.notice.kind === 'error' ? 'notice-error' : ''}
        data-testid="notice"
        role="status"
        >${s.notice.text}</span
      >`,
    );
  }
  const update = renderAppUpdate();
  if (update) parts.push(update);
  return parts;
}
