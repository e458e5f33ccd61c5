/** Opens the printable brief of the current result in a new tab, with its print button wired. */
import { briefHtml, briefSafety } from '../brief';
import { computedPair } from './downloads';
import type { PlanStore } from './plan-store';

/**
 * The brief may run no script of its own (its Content-Security-Policy), so the app wires the
 * brief's print button once the tab (same origin: a blob URL of this page) has loaded it.
 */
function wirePrintButton(w: Window, triesLeft = 100): void {
  let button: Element | null | undefined;
  try {
    button = w.document?.querySelector('[data-action=print]');
  } catch {
    return; // the tab went elsewhere
  }
  if (button) button.addEventListener('click', () => w.print());
  else if (triesLeft > 0 && !w.closed) setTimeout(() => wirePrintButton(w, triesLeft - 1), 100);
}

/** Opens the printable brief of the current result in a new tab. */
export function openBrief(s: PlanStore): void {
  const pair = computedPair(s, 'brief');
  if (!pair) return;
  const html = briefHtml(pair.plan, pair.result, {
    paper: s.settings.paper,
    printBar: true,
    safety: s.safety ? briefSafety(s.safety, pair.result) : undefined,
    sweep: s.sweep && s.sweep.plan === pair.plan ? s.sweep : undefined,
    timeline: s.timeline && s.timeline.plan === pair.plan ? s.timeline.entries : undefined,
  });
  const url = URL.createObjectURL(new Blob([html], { type: 'text/html' }));
  const w = window.open(url, '_blank');
  if (!w) s.setNotice('error', 'The brief could not open: allow pop-ups for this page.');
  else wirePrintButton(w);
  setTimeout(() => URL.revokeObjectURL(url), 60_000);
}
