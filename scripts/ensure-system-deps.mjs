// Runs before `npm test`: the browser tests drive Debian's Chromium, the brief tests read PDFs
// with poppler-utils and the terrain tests check elevation models against gdal-bin. On a fresh
// Debian machine, as root, it installs what is missing (as
// .ci/run does); otherwise it stops at once with the exact command to run.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

/** Debian package → a file it installs that the tests use. */
const NEEDED = [
  { pkg: 'chromium', file: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium' },
  { pkg: 'poppler-utils', file: '/usr/bin/pdftotext' },
  { pkg: 'fonts-dejavu-core', file: '/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf' },
  { pkg: 'gdal-bin', file: '/usr/bin/gdallocationinfo' },
];

const missing = NEEDED.filter((n) => !existsSync(n.file)).map((n) => n.pkg);
if (missing.length === 0) process.exit(0);

const command = `apt-get update && apt-get install -y --no-install-recommends ${missing.join(' ')}`;
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
const hasApt = spawnSync('sh', ['-c', 'command -v apt-get'], { stdio: 'ignore' }).status === 0;
if (!isRoot || !hasApt) {
  console.error(
    `The tests need these Debian packages, which are not installed: ${missing.join(', ')}.\n` +
      `Install them first, then run npm test again:\n  sudo sh -c '${command}'`,
  );
  process.exit(1);
}
console.log(`Installing the Debian packages the tests need: ${missing.join(', ')}`);
const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
try {
  execFileSync('sh', ['-c', command], { stdio: 'inherit', env });
} catch {
  console.error(`Installing failed. Run it by hand, then npm test again:\n  ${command}`);
  process.exit(1);
}
const still = NEEDED.filter((n) => !existsSync(n.file)).map((n) => `${n.pkg} (${n.file})`);
if (still.length > 0) {
  console.error(`Still missing after installing: ${still.join(', ')}`);
  process.exit(1);
}
