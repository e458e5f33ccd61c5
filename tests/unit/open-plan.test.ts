import { describe, expect, it } from 'vitest';
import { MAX_PLAN_BYTES } from '../../app/plan';
import { openPlanFile } from '../../app/ui/open-plan';
import { PlanStore } from '../../app/ui/plan-store';
import demo from '../../data/demo-plan.json';

// The app opens plan files as the CLI reads them (README, command line): a UTF-8 byte-order mark
// is skipped (Unicode 15, §23.8: U+FEFF at the start of a text is a signature, not content) and a
// file over the plan-file bound is refused unread.
const store = () => new PlanStore(demo as Record<string, unknown>, null);

describe('opening a plan file in the app', () => {
  it('accepts a plan written with a UTF-8 byte-order mark', async () => {
    const s = store();
    const other = { ...structuredClone(demo), name: 'Opened with a BOM' };
    await openPlanFile(s, new File([`\uFEFF${JSON.stringify(other)}`], 'bom.json'));
    expect(s.notice).toEqual({ kind: 'info', text: 'Opened bom.json.' });
    expect(s.get('name')).toBe('Opened with a BOM');
  });

  it('refuses a file over the bound without reading it, and keeps the plan', async () => {
    const s = store();
    const big = new File([new Uint8Array(MAX_PLAN_BYTES + 1)], 'huge.json');
    await openPlanFile(s, big);
    expect(s.notice?.kind).toBe('error');
    expect(s.notice?.text).toContain('huge.json was not opened: it is larger than 32 MiB');
    expect(s.get('name')).toBe(demo.name);
  });

  it('refuses a file that is not JSON and names it', async () => {
    const s = store();
    await openPlanFile(s, new File(['{ nope'], 'broken.json'));
    expect(s.notice?.text).toMatch(/^broken\.json was not opened: it is not JSON/);
    expect(s.get('name')).toBe(demo.name);
  });
});
