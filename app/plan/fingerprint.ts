// Fingerprint of a plan for the sign-off: the plan without its sign-off, hashed.
import type { Plan } from './plan';

/**
 * Fingerprint of a plan without its sign-off (FNV-1a, 32 bit, hex): any edit after signing — a
 * site, a wind, a checklist tick — changes it and so voids the sign-off.
 */
export function planFingerprint(plan: Plan): string {
  const copy: Plan = {
    ...plan,
    safety: plan.safety ? { ...plan.safety, signoff: undefined } : undefined,
  };
  const text = JSON.stringify(copy);
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, '0');
}
