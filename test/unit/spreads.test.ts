import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

/**
 * No spread of an unbounded array into a call. `Math.max(...values)` or `out.push(...rows)` passes
 * every element as an argument on the stack, and V8 overflows it somewhere above 100,000 elements:
 * a 150,000-point run failed that way. A spread into a call is allowed only where its length is
 * bounded by construction, said on the same line with a `bounded spread:` comment naming the bound.
 * (Array and object literals `[...a]`, `{...o}` copy without the stack and are not checked.)
 */
const ROOT = resolve(__dirname, '../..');
const MARK = /bounded spread:/;

function sources(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      if (name === 'node_modules' || name === 'dist') continue;
      if (statSync(p).isDirectory()) walk(p);
      else if (/\.(ts|cts|mts|vue)$/.test(name) && !name.endsWith('.d.ts')) out.push(p);
    }
  };
  walk(join(ROOT, dir));
  return out;
}

/** The script blocks of a .vue file, with the lines before them blanked so positions stay right. */
function scriptOf(path: string, text: string): string {
  if (!path.endsWith('.vue')) return text;
  const lines = text.split('\n');
  let inside = false;
  return lines
    .map((l) => {
      if (/^<script\b/.test(l)) {
        inside = true;
        return '';
      }
      if (/^<\/script>/.test(l)) inside = false;
      return inside ? l : '';
    })
    .join('\n');
}

/** `file:line  text` of every spread argument in a call or `new` without the mark on its line. */
export function unboundedSpreads(path: string, text: string): string[] {
  const code = scriptOf(path, text);
  const sf = ts.createSourceFile(path, code, ts.ScriptTarget.Latest, true, ts.ScriptKind.TS);
  const lines = code.split('\n');
  const found: string[] = [];
  const visit = (node: ts.Node) => {
    if ((ts.isCallExpression(node) || ts.isNewExpression(node)) && node.arguments?.some(ts.isSpreadElement)) {
      const line = sf.getLineAndCharacterOfPosition(node.getStart(sf)).line;
      if (!MARK.test(lines[line] ?? '')) found.push(`${relative(ROOT, path)}:${line + 1}  ${(lines[line] ?? '').trim()}`);
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return found;
}

describe('no spread of unbounded arrays into calls', () => {
  it('finds the patterns it is meant to find (and not rest parameters or array copies)', () => {
    const sample = [
      'const a = Math.max(...xs);',
      'out.push(...rows.map((r) => r.x));',
      'const s = String.fromCharCode(...bytes);',
      'const n = new Set(...args);',
      'const ok = Math.hypot(...v); // bounded spread: a 3-vector',
      'const copy = [...xs];',
      'const o = { ...p };',
      'function f(...args: number[]) { return args; }',
    ].join('\n');
    expect(unboundedSpreads(join(ROOT, 'x.ts'), sample).map((l) => l.split('  ')[0])).toEqual(['x.ts:1', 'x.ts:2', 'x.ts:3', 'x.ts:4']);
  });

  it.each(['core', 'app', 'renderer/src'])('%s has none', (dir) => {
    const found = sources(dir).flatMap((p) => unboundedSpreads(p, readFileSync(p, 'utf8')));
    expect(found).toEqual([]);
  });
});
