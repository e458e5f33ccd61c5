// The sign-off of <sf-safety-panel>: a name, a reason when checks fail, and "Mark ready".
import { css, html, type ReactiveControllerHost } from 'lit';
import { planFingerprint } from '../plan';
import { doneWithoutName } from '../safety';
import type { PlanStore } from './plan-store';

/** Styles of the sign-off form. */
export const signOffStyles = css`
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
`;

/** The name and reason typed and why the last "Mark ready" was refused; renders the form. */
export class SafetySignOff {
  /** The name typed; crew items marked done or n/a without a name take it. */
  signer = '';
  private reason = '';
  private signError = '';

  constructor(private readonly host: ReactiveControllerHost & { readonly store?: PlanStore }) {}

  private refuse(why: string): void {
    this.signError = why;
    this.host.requestUpdate();
  }

  private readonly signOff = (): void => {
    const s = this.host.store;
    const safety = s?.safety;
    if (!s || !safety || !s.plan) return;
    if (!s.current) {
      this.refuse(
        'Planning is still running for the latest edits: sign off once the checks are up to date.',
      );
      return;
    }
    const who = this.signer.trim();
    if (!who) {
      this.refuse('Enter your name to sign the plan off.');
      return;
    }
    const failing = safety.checks.filter((c) => c.status === 'fail');
    if (failing.length > 0 && !this.reason.trim()) {
      this.refuse(`${failing.length} automatic check(s) fail: write the reason for going ahead.`);
      return;
    }
    const unnamed = safety.checklist.filter(doneWithoutName);
    if (unnamed.length > 0) {
      const what = unnamed.map((m) => `“${m.text}”`);
      this.refuse(
        `${unnamed.length === 1 ? 'A crew item is' : `${unnamed.length} crew items are`} marked ` +
          `done with nobody named (${what.slice(0, 3).join(', ')}${what.length > 3 ? ` and ${what.length - 3} more` : ''}): ` +
          'enter who checked each one first.',
      );
      return;
    }
    if (safety.checklist.some((m) => m.state === 'open')) {
      this.refuse('Every crew item must be done or marked not applicable first.');
      return;
    }
    this.refuse('');
    s.edit('safety.signoff', {
      who,
      when: new Date().toISOString().slice(0, 16),
      planHash: planFingerprint(s.plan),
      ...(failing.length > 0
        ? { reason: this.reason.trim(), covers: failing.map((c) => c.id) }
        : {}),
    });
  };

  render() {
    return html`<div class="signoff">
      <label
        >Your name
        <input
          data-testid="signer"
          .value=${this.signer}
          @input=${(e: Event) => {
            this.signer = (e.target as HTMLInputElement).value;
            this.host.requestUpdate();
          }}
      /></label>
      <label
        >Reason for going ahead despite failing checks (recorded with your name and time)
        <textarea
          data-testid="override-reason"
          .value=${this.reason}
          @input=${(e: Event) => {
            this.reason = (e.target as HTMLTextAreaElement).value;
            this.host.requestUpdate();
          }}
        ></textarea>
      </label>
      <div class="row">
        <button @click=${this.signOff}>Mark ready</button>
        ${this.signError ? html`<span class="field-error" role="alert">${this.signError}</span>` : ''}
      </div>
    </div>`;
  }
}
