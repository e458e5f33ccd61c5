// The import rule of app/ (app/layers.json): which folder may import which, and only through the
// folder's index.ts. Used by tests/unit/import-rules.test.ts; ESLint enforces the same table.
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, posix, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import layers from '../../app/layers.json';

export const APP_DIR = fileURLToPath(new URL('../../app/', import.meta.url));

/** Module specifiers of every static import/export-from, side-effect import and dynamic import. */
export function importSpecifiers(text: string): string[] {
  const code = text.replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '');
  const found: string[] = [];
  const patterns = [
    /(?:^|[\n;])\s*(?:import|export)\s[^;'"]*?\sfrom\s*['"]([^'"]+)['"]/g,
    /(?:^|[\n;])\s*import\s*['"]([^'"]+)['"]/g,
    /\bimport\s*\(\s*['"]([^'"]+)['"]\s*\)/g,
  ];
  for (const re of patterns) for (const m of code.matchAll(re)) found.push(m[1]);
  return found;
}

/** The layer a file of app/ belongs to: its folder, or its own name for a top-level file. */
function layerOf(appPath: string): string | null {
  const head = appPath.split('/')[0];
  return head === '..' || head === '' ? null : head;
}

const allowed = (from: string): string[] | undefined =>
  (layers.folders as Record<string, string[]>)[from] ??
  (layers.topLevel as Record<string, string[]>)[from];

/**
 * Problems with the imports of one file of app/ (`appPath` relative to app/, e.g.
 * 'model/wind.ts'): a forbidden edge between folders, a door bypass (importing a file inside
 * another folder instead of its index.ts), or Leaflet/Lit below the map.
 */
export function importProblems(appPath: string, text: string): string[] {
  const from = layerOf(appPath);
  if (from === null) return [];
  const may = allowed(from);
  if (!may) return [`app/${appPath}: app/${from} is not in app/layers.json`];
  const problems: string[] = [];
  for (const spec of importSpecifiers(text)) {
    if (!spec.startsWith('.')) {
      const browser = layers.browserLibraries.some((b) =>
        b.endsWith('/') ? spec.startsWith(b) : spec === b || spec.startsWith(`${b}/`),
      );
      if (browser && layers.noBrowserLibraries.includes(from)) {
        problems.push(`app/${appPath}: imports ${spec}; no Leaflet or Lit below the map`);
      }
      continue;
    }
    const target = posix.normalize(posix.join(posix.dirname(appPath), spec));
    if (target.startsWith('../')) continue; // outside app/ (data/)
    const parts = target.split('/');
    const head = parts[0];
    const to =
      parts.length > 1 || head in layers.folders
        ? head
        : head.endsWith('.ts')
          ? head
          : `${head}.ts`;
    if (to === from) continue;
    // A folder's door is the folder itself or its index; a top-level file is its own door.
    const isFolder = to in layers.folders;
    const throughDoor =
      !isFolder || parts.length === 1 || (parts.length === 2 && /^index(\.ts)?$/.test(parts[1]));
    if (!may.includes(to)) {
      problems.push(
        `app/${appPath}: imports app/${to} ('${spec}'); app/${from} may import ${may.join(', ') || 'nothing of ours'}`,
      );
    } else if (!throughDoor) {
      problems.push(
        `app/${appPath}: imports '${spec}' inside app/${to}; import '${door(appPath, to)}' (its index.ts) instead`,
      );
    }
  }
  return problems;
}

/** How `appPath` names folder `to`'s door: '../model' or './model'. */
function door(appPath: string, to: string): string {
  const r = relative(dirname(appPath), to);
  return r.startsWith('.') ? r : `./${r}`;
}

/** Every .ts file of app/, relative to app/ with '/' separators. */
export function appSources(dir = APP_DIR): string[] {
  const out: string[] = [];
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) out.push(...appSources(p));
    else if (e.name.endsWith('.ts') && !e.name.endsWith('.d.ts'))
      out.push(relative(APP_DIR, p).split('\\').join('/'));
  }
  return out.sort();
}

/** Import problems of the whole app/ tree. */
export function treeProblems(): string[] {
  return appSources().flatMap((f) => importProblems(f, readFileSync(join(APP_DIR, f), 'utf8')));
}
