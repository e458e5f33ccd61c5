import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

// common practice: a pointer in the docs that leads nowhere is a broken doc. The contributor
// guide, the README, docs/ and the test READMEs name source files by path; docs and tests cite
// published values from docs/references.md, kept inside the project.
const ROOT = join(import.meta.dirname, '../..');
const markdown = (dir: string): string[] =>
  readdirSync(join(ROOT, dir), { withFileTypes: true }).flatMap((e) =>
    e.isDirectory()
      ? markdown(join(dir, e.name))
      : e.name.endsWith('.md')
        ? [join(dir, e.name)]
        : [],
  );
const DOCS = ['README.md', 'DEVELOPERS.md', ...markdown('docs'), 'tests/hostile/README.md'];

describe('paths named in the docs', () => {
  it('every app/… file a doc names exists', () => {
    const missing: string[] = [];
    for (const doc of DOCS) {
      const text = readFileSync(join(ROOT, doc), 'utf8');
      for (const [path] of text.matchAll(/\bapp\/[\w./-]+\.(?:ts|js|json)\b/g)) {
        if (!existsSync(join(ROOT, path))) missing.push(`${doc}: ${path}`);
      }
    }
    expect(missing).toEqual([]);
  });

  it('citations of published values point at docs/references.md, which exists', () => {
    expect(existsSync(join(ROOT, 'docs/references.md'))).toBe(true);
    const outside: string[] = [];
    for (const dir of ['tests/unit', 'docs']) {
      for (const f of readdirSync(join(ROOT, dir))) {
        if (!/\.(ts|md)$/.test(f) || f === 'doc-paths.test.ts') continue;
        const text = readFileSync(join(ROOT, dir, f), 'utf8');
        // A bare REFERENCES.md (the shared notes outside the repo) does not resolve here.
        if (/(?<![\w/])REFERENCES\.md/.test(text)) outside.push(`${dir}/${f}`);
      }
    }
    expect(outside).toEqual([]);
  });
});
