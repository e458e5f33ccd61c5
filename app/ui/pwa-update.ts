/**
 * The notice that a new version of the app is ready. The service worker (registered in
 * app/main.ts) installs a new version in the background; it takes over only when the person
 * clicks Reload, so an edit in progress is never cut off by a reload they did not ask for.
 */
import { html, type TemplateResult } from 'lit';

interface UpdateState {
  /** A new version is installed and waiting (or already took over from another tab). */
  ready: boolean;
  /** Lets the waiting version take over and reloads the page; set by whoever registered it. */
  apply: () => void;
}

const state: UpdateState = { ready: false, apply: () => {} };

/** Shows the notice (`redraw` draws the status area again); `apply` runs on the person's click only. */
export function offerAppUpdate(apply: () => void, redraw: () => void): void {
  state.ready = true;
  state.apply = apply;
  redraw();
}

/** The notice for the status line, or nothing when no new version waits. */
export function renderAppUpdate(): TemplateResult | null {
  if (!state.ready) return null;
  return html`<span class="app-update" data-testid="app-update" role="status"
    >A new version is ready —
    <button type="button" data-testid="app-update-reload" @click=${() => state.apply()}>
      Reload
    </button></span
  >`;
}
