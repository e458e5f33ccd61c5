import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';
import layers from '../../app/layers.json';
import {
  appSources,
  importProblems,
  importSpecifiers,
  treeProblems,
} from '../support/import-rules';

// The house rule (DEVELOPERS.md, "Architecture"; the table in app/layers.json): imports go
// ui → map → (brief, formats, safety) → planner → plan → model, each folder only through its
// index.ts. // common practice (layered architecture with one public module per package)
describe('the import rule of app/', () => {
  it('holds for every source file', () => {
    expect(appSources().length).toBeGreaterThan(50);
    expect(treeProblems()).toEqual([]);
  });

  it('gives every folder of app/ a place in the table', () => {
    const folders = new Set(
      appSources()
        .filter((f) => f.includes('/'))
        .map((f) => f.split('/')[0]),
    );
    for (const f of folders) expect(Object.keys(layers.folders)).toContain(f);
  });

  it('finds static, type-only, multi-line, re-export, side-effect and dynamic imports', () => {
    const text = [
      "import { a } from '../plan';",
      "import type { B } from '../planner';",
      'import {\n  c,\n  d,\n} from "../model";',
      "export { e } from './e';",
      "import './side-effect';",
      "const m = await import('../brief');",
      "// import { x } from '../ui';",
    ].join('\n');
    expect(importSpecifiers(text)).toEqual([
      '../plan',
      '../planner',
      '../model',
      './e',
      './side-effect',
      '../brief',
    ]);
  });

  it('fails on a model file that imports the planner (a forbidden edge)', () => {
    const text = "import { planDrop } from '../planner';\nexport const x = planDrop;\n";
    expect(importProblems('model/wind.ts', text)).toEqual([
      "app/model/wind.ts: imports app/planner ('../planner'); app/model may import nothing of ours",
    ]);
  });

  it('fails on a type-only import upward (the plan importing the safety layer)', () => {
    const problems = importProblems(
      'plan/validate.ts',
      "import type { PlanSafety } from '../safety';",
    );
    expect(problems).toHaveLength(1);
    expect(problems[0]).toContain('app/plan may import model');
  });

  it('fails on an import past a folder’s door', () => {
    const problems = importProblems(
      'planner/planner.ts',
      "import { FallTable } from '../model/fall-table';",
    );
    expect(problems).toEqual([
      "app/planner/planner.ts: imports '../model/fall-table' inside app/model; import '../model' (its index.ts) instead",
    ]);
  });

  it('fails on Leaflet or Lit below the map', () => {
    expect(importProblems('brief/brief-svg.ts', "import L from 'leaflet';")).toHaveLength(1);
    expect(importProblems('safety/safety.ts', "import { html } from 'lit';")).toHaveLength(1);
    expect(importProblems('map/plan-layers.ts', "import L from 'leaflet';")).toEqual([]);
  });

  it('accepts the allowed edges: through the door, inside a folder, and to data/', () => {
    const text = [
      "import { planDrop } from '../planner';",
      "import { FallTable } from '../model/index';",
      "import { esc } from './brief-svg';",
      "import demo from '../../data/demo-plan.json';",
    ].join('\n');
    expect(importProblems('brief/wind-plots.ts', text)).toEqual([]);
  });

  it('is enforced by ESLint too: the same wrong imports fail the lint', async () => {
    const eslint = new ESLint();
    const text = [
      "import { planDrop } from '../planner';",
      "import { validatePlan } from '../plan/validate';",
      "import L from 'leaflet';",
      'export const x = [planDrop, validatePlan, L];',
      '',
    ].join('\n');
    const [report] = await eslint.lintText(text, { filePath: 'app/model/synthetic.ts' });
    const rules = report.messages.map((m) => `${m.line}:${m.ruleId}`);
    expect(rules).toContain('1:no-restricted-imports');
    expect(rules).toContain('2:no-restricted-imports');
    expect(rules).toContain('3:no-restricted-imports');
    const [clean] = await eslint.lintText(
      "import { esc } from '../brief';\nexport const y = esc;\n",
      {
        filePath: 'app/map/synthetic.ts',
      },
    );
    expect(clean.messages).toEqual([]);
  }, 60_000);
});
