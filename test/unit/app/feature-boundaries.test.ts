/**
 * The client's layering (DESIGN.md, "Layout"): a feature imports `core/` and `shared/`, never
 * another feature; `core/` and `shared/` import no feature. Data access used by several features
 * lives in `core/data/`, UI pieces used by several features in `shared/`, and `app.routes.ts`
 * mounts each feature's pages (the athlete's under `/portal` too). Reads every import, static and
 * dynamic, of every TypeScript file under `src/app/`.
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const APP = path.resolve(import.meta.dirname, '../../../src/app');
const FEATURES = path.join(APP, 'features');

function filesUnder(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    return e.isDirectory() ? filesUnder(p) : e.name.endsWith('.ts') ? [p] : [];
  });
}

/** Relative specifiers of `import … from`, `export … from`, `import '…'` and `import('…')`. */
export function importSpecifiers(source: string): string[] {
  const found: string[] = [];
  for (const m of source.matchAll(/(?:\bfrom\s+|\bimport\s*\(\s*|\bimport\s+)['"](\.{1,2}\/[^'"]*)['"]/g)) found.push(m[1]!);
  return found;
}

/** The feature folder a path lies in, or null outside `features/`. */
function featureOf(file: string): string | null {
  const rel = path.relative(FEATURES, file);
  return rel.startsWith('..') ? null : rel.split(path.sep)[0]!;
}

/** `from → to` for every import of a file under `src/app/` that lands in a feature. */
function importsIntoFeatures(): { from: string; to: string; feature: string }[] {
  const out: { from: string; to: string; feature: string }[] = [];
  for (const file of filesUnder(APP)) {
    for (const spec of importSpecifiers(fs.readFileSync(file, 'utf8'))) {
      const target = path.resolve(path.dirname(file), spec);
      const feature = featureOf(target);
      if (feature) out.push({ from: path.relative(APP, file), to: path.relative(APP, target), feature });
    }
  }
  return out;
}

describe('client layering', () => {
  it('reads static, re-exported and dynamic imports alike', () => {
    const source = [
      "import { A } from '../a';",
      "import type { B } from './b';",
      "export { C } from '../../c';",
      "import './side-effect';",
      "loadComponent: () => import('../other/page').then((m) => m.Page),",
      "import { D } from '@angular/core';",
    ].join('\n');
    expect(importSpecifiers(source)).toEqual(['../a', './b', '../../c', './side-effect', '../other/page']);
  });

  it('no feature imports another feature', () => {
    const crossing = importsIntoFeatures()
      .filter((i) => i.from.startsWith('features/') && i.from.split('/')[1] !== i.feature)
      .map((i) => `${i.from} → ${i.to}`);
    expect(crossing).toEqual([]);
  });

  it('core/ and shared/ import no feature', () => {
    const upward = importsIntoFeatures()
      .filter((i) => i.from.startsWith('core/') || i.from.startsWith('shared/'))
      .map((i) => `${i.from} → ${i.to}`);
    expect(upward).toEqual([]);
  });
});
