import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

/** The dependency review in DEVELOPERS.md covers every runtime dependency, with its real licence. */
const root = path.resolve(import.meta.dirname, '../../..');
const pkg = JSON.parse(readFileSync(path.join(root, 'package.json'), 'utf8')) as { dependencies: Record<string, string> };
const guide = readFileSync(path.join(root, 'DEVELOPERS.md'), 'utf8');
const review = guide.slice(guide.indexOf('## Dependency review'));
const rows = new Map(
  [...review.matchAll(/^\| `([^`]+)` \| ([^|]+) \| ([^|]+) \|$/gm)].map((m) => [m[1], { why: m[2].trim(), licence: m[3].trim() }]),
);

describe('dependency review', () => {
  it.each(Object.keys(pkg.dependencies))('%s is listed with why and its licence', (name) => {
    const row = rows.get(name);
    expect(row, `add ${name} to the dependency review in DEVELOPERS.md`).toBeTruthy();
    expect(row!.why.length).toBeGreaterThan(5);
    const meta = JSON.parse(readFileSync(path.join(root, 'node_modules', name, 'package.json'), 'utf8')) as { license?: string };
    expect(row!.licence).toBe(meta.license);
  });

  it('lists nothing that is not a dependency', () => {
    expect([...rows.keys()].filter((n) => !(n in pkg.dependencies))).toEqual([]);
  });
});
