/**
 * Writes a plan with N generated sites over the demo area to stdout (tests/support/make-field.ts):
 *   npx tsx scripts/make-field.ts <N> [seed] > field.json
 */
import { makeField } from '../tests/support/make-field';

const [nArg, seedArg] = process.argv.slice(2);
const n = Number(nArg);
const seed = seedArg === undefined ? 1 : Number(seedArg);
if (!Number.isInteger(n) || n < 0 || n > 1000 || !Number.isInteger(seed) || seed < 0) {
  process.stderr.write('usage: npx tsx scripts/make-field.ts <N 0…1000> [seed ≥ 0] > field.json\n');
  process.exit(1);
}
process.stdout.write(`${JSON.stringify(makeField(n, seed), null, 1)}\n`);
