import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { GOLDEN_DIR, goldenOutputs } from '../support/golden';

// The demo plan's outputs must stay byte for byte what tests/fixtures/golden/ holds (made before
// the source tree was reorganised; its README says what each file is). An intended change of
// output is recorded with UPDATE_GOLDEN=1 (or `npx tsx scripts/golden.ts`) and reviewed as a diff;
// the test never rewrites the files on its own.
const update = process.env.UPDATE_GOLDEN === '1';

describe('golden outputs of the demo plan', async () => {
  const outputs = await goldenOutputs();

  it('makes every output the README lists', () => {
    const readme = readFileSync(join(GOLDEN_DIR, 'README.md'), 'utf8');
    for (const name of Object.keys(outputs)) expect(readme).toContain(`\`${name}\``);
  });

  for (const [name, text] of Object.entries(outputs)) {
    it(`${name} is byte for byte the recorded output`, () => {
      const file = join(GOLDEN_DIR, name);
      if (update) writeFileSync(file, text);
      const recorded = readFileSync(file);
      // Compared as bytes (a BOM or line ending is a difference too), then as text for a diff.
      if (!Buffer.from(text, 'utf8').equals(recorded)) {
        expect(text).toBe(recorded.toString('utf8'));
        expect.unreachable(`${name} differs in its bytes only`);
      }
    });
  }

  it('tells a difference apart (a changed byte is found)', () => {
    const text = outputs['sites.csv'];
    const changed = text.replace(/\d/, (d) => String((Number(d) + 1) % 10));
    expect(Buffer.from(changed, 'utf8').equals(readFileSync(join(GOLDEN_DIR, 'sites.csv')))).toBe(
      false,
    );
  });
});
