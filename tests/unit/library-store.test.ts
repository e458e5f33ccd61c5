import { describe, expect, it } from 'vitest';
import { MAX_PLAN_BYTES } from '../../app/plan';
import { readRecord, sizeText } from '../../app/ui/library-link';
import {
  nameFrom,
  nameProblem,
  sizeProblem,
  utf8Bytes,
  withName,
} from '../../app/ui/library-store';

// The plan library's checks on names, sizes and stored records (app/ui/library-store.ts,
// library-link.ts). Limits are this project's (1–200 characters as plan.schema.json's name;
// MAX_PLAN_BYTES as an opened plan file).

describe('plan names in the library', () => {
  it('are 1 to 200 characters of text, counted after trimming', () => {
    expect(nameProblem('A')).toBeNull();
    expect(nameProblem(`  ${'x'.repeat(200)}  `)).toBeNull();
    expect(nameProblem('   ')).toMatch(/empty/);
    expect(nameProblem('x'.repeat(201))).toBe(
      'The name is 201 characters long; a plan name has 1 to 200.',
    );
    expect(nameProblem('two\nlines')).toMatch(/control characters/);
  });

  it('taken from stored or file values: text only, control characters out, cut to 200', () => {
    expect(nameFrom(5, 'Fallback')).toBe('Fallback');
    expect(nameFrom('  ', 'Fallback')).toBe('Fallback');
    expect(nameFrom('a\u0000b\tc', 'F')).toBe('a b c');
    expect(nameFrom('y'.repeat(500), 'F')).toHaveLength(200);
  });

  it('are written into a plan draft, leaving text that is not a plan object as it was', () => {
    expect(JSON.parse(withName('{"name":"a","sites":[]}', 'b') as string)).toEqual({
      name: 'b',
      sites: [],
    });
    expect(withName('{"name": "cut', 'b')).toBe('{"name": "cut');
    expect(withName('[1]', 'b')).toBe('[1]');
  });
});

describe('plan sizes', () => {
  it('count UTF-8 bytes', () => {
    // UTF-8 (RFC 3629): ASCII 1 byte, "é" 2, "€" 3, "𝄞" 4. // common practice
    expect(utf8Bytes('aé€𝄞')).toBe(10);
  });

  it('are refused past MAX_PLAN_BYTES with both sizes named', () => {
    expect(sizeProblem(MAX_PLAN_BYTES)).toBeNull();
    expect(sizeProblem(MAX_PLAN_BYTES + 1)).toBe(
      'the plan is 32.0 MiB, over the 32.0 MiB a plan in the library may take',
    );
    expect(sizeProblem(40 * 1024 * 1024)).toMatch(/^the plan is 40\.0 MiB/);
  });

  it('are shown in decimal units as browsers report storage', () => {
    // SI prefixes, k = 10^3, M = 10^6 (as navigator.storage.estimate() counts bytes). // common practice
    expect(sizeText(999)).toBe('999 B');
    expect(sizeText(3400)).toBe('3.4 kB');
    expect(sizeText(5_000_000)).toBe('5.0 MB');
    expect(sizeText(2_500_000_000)).toBe('2.50 GB');
  });
});

describe('stored records read back', () => {
  it('open when their draft is a plan object, with the text as stored', () => {
    const r = readRecord({ id: 'a', name: 'Trial', draft: '{"name":"Trial"}' });
    expect(r).toEqual({
      ok: true,
      name: 'Trial',
      draft: { name: 'Trial' },
      text: '{"name":"Trial"}',
    });
  });

  it('are reported, with the reason, when they are damaged', () => {
    expect(readRecord(null)).toMatchObject({ ok: false, reason: 'the entry is not a plan record' });
    expect(readRecord({ name: 'N', draft: 7 })).toMatchObject({
      ok: false,
      name: 'N',
      reason: 'its plan text is missing',
    });
    expect(readRecord({ name: 'N', draft: '{"a":' })).toMatchObject({
      ok: false,
      reason: expect.stringMatching(/^it is not JSON/) as unknown,
    });
    expect(readRecord({ name: 4, draft: '[]' })).toMatchObject({
      ok: false,
      name: '(no name)',
      reason: 'it holds a list, not a plan',
    });
  });
});
