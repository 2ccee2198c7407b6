import { readdirSync, readFileSync, statSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { join, relative, resolve, sep } from 'node:path';
import { describe, expect, it } from 'vitest';

/**
 * The layering of docs/architecture.md §1: core is pure (no Node, no Electron, no DOM-only hosts, nothing of app or
 * renderer); renderer never imports Node or Electron and nothing of app; app never imports renderer.
 */
const ROOT = resolve(__dirname, '../..');

function sources(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else if (/\.(ts|cts|mts|vue)$/.test(name)) out.push(p);
    }
  };
  walk(join(ROOT, dir));
  return out;
}

/** Module specifiers of static imports, dynamic imports and requires. */
export function importsOf(text: string): string[] {
  const specs: string[] = [];
  const re = /(?:import|export)\s[^'"]*?from\s*['"]([^'"]+)['"]|import\s*\(\s*['"]([^'"]+)['"]\s*\)|require\s*\(\s*['"]([^'"]+)['"]\s*\)|^\s*import\s*['"]([^'"]+)['"]/gm;
  let m: RegExpExecArray | null;
  while ((m = re.exec(text))) specs.push((m[1] ?? m[2] ?? m[3] ?? m[4])!);
  return specs;
}

/** Every Node built-in, with or without the node: prefix and with sub-paths (fs/promises), from Node's own list. */
const NODE_BUILTINS = { test: (spec: string) => spec.startsWith('node:') || builtinModules.includes(spec) || builtinModules.includes(spec.split('/')[0]!) };

function violations(layer: string, forbidden: (spec: string, target: string) => string | undefined): string[] {
  const out: string[] = [];
  for (const file of sources(layer)) {
    for (const spec of importsOf(readFileSync(file, 'utf8'))) {
      const target = spec.startsWith('.') ? relative(ROOT, resolve(file, '..', spec)).split(sep)[0]! : spec;
      const why = forbidden(spec, target);
      if (why) out.push(`${relative(ROOT, file)} imports ${spec}: ${why}`);
    }
  }
  return out;
}

describe('layering', () => {
  it('finds imports of every form (so the checks below can fail)', () => {
    expect(importsOf(`import a from 'x';\nimport { b } from "../y.ts";\nconst c = await import('z');\nrequire('w');\nimport 'side';\nexport { d } from './e.ts';`)).toEqual(['x', '../y.ts', 'z', 'w', 'side', './e.ts']);
  });

  it('keeps core pure: no Node, Electron, app or renderer', () => {
    expect(
      violations('core', (spec, target) => {
        if (NODE_BUILTINS.test(spec)) return 'Node built-in in core';
        if (spec === 'electron' || spec.startsWith('electron/')) return 'Electron in core';
        if (target === 'app' || target === 'renderer') return `core must not depend on ${target}`;
        return undefined;
      }),
    ).toEqual([]);
  });

  it('keeps Node and Electron out of the renderer, and app out of it', () => {
    expect(
      violations('renderer', (spec, target) => {
        if (NODE_BUILTINS.test(spec)) return 'Node built-in in the renderer';
        if (spec === 'electron' || spec.startsWith('electron/')) return 'Electron in the renderer';
        if (target === 'app') return 'the renderer reaches the host only through its host interface';
        return undefined;
      }),
    ).toEqual([]);
  });

  it('lets app and renderer reach core only through its public entry, core/index.ts', () => {
    const entryOnly = (spec: string, target: string) => {
      if (target !== 'core' || !spec.startsWith('.')) return undefined;
      return /(^|\/)core\/index\.ts$/.test(spec) ? undefined : 'import core through core/index.ts';
    };
    expect([...violations('app', entryOnly), ...violations('renderer', entryOnly)]).toEqual([]);
  });

  it('knows every Node built-in, so a core import of any of them fails', () => {
    for (const spec of ['events', 'fs/promises', 'node:events', 'zlib', 'readline', 'dns', 'v8', 'perf_hooks', 'string_decoder']) expect(NODE_BUILTINS.test(spec)).toBe(true);
    expect(NODE_BUILTINS.test('papaparse')).toBe(false);
  });

  it('keeps the renderer out of app', () => {
    expect(violations('app', (_spec, target) => (target === 'renderer' ? 'app must not import the renderer' : undefined))).toEqual([]);
  });
});
