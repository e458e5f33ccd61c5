// Rewrites the golden outputs of the demo plan (tests/fixtures/golden/, see its README) after an
// intended change of output: `npx tsx scripts/golden.ts`. Review the diff before committing it.
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { GOLDEN_DIR, goldenOutputs } from '../tests/support/golden';

mkdirSync(GOLDEN_DIR, { recursive: true });
for (const [name, text] of Object.entries(await goldenOutputs())) {
  writeFileSync(join(GOLDEN_DIR, name), text);
  console.log(`wrote ${join(GOLDEN_DIR, name)} (${text.length} characters)`);
}
