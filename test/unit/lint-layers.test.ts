import { resolve } from 'node:path';
import { ESLint } from 'eslint';
import { beforeAll, describe, expect, it } from 'vitest';

/**
 * The layering rules of eslint.config.js (docs/architecture.md §1) fire on code placed in each layer:
 * small fixture texts linted as if they were files under core/, renderer/ and app/. The regex scan in
 * layers.test.ts checks the tree as it is; this checks that `npm run lint` would stop a new violation.
 */
const ROOT = resolve(__dirname, '../..');
let eslint: ESLint;

beforeAll(() => {
  eslint = new ESLint({ cwd: ROOT });
});

const LAYER_RULES = ['no-restricted-imports', 'no-restricted-globals', 'no-restricted-syntax'];

/** The layering findings (rule id and message) for `code` linted as the file at `path`. */
async function layering(path: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: resolve(ROOT, path) });
  return result!.messages.filter((m) => LAYER_RULES.includes(m.ruleId ?? '')).map((m) => `${m.ruleId}: ${m.message}`);
}

describe('layering rules of the linter', () => {
  it('accepts a pure core module: a package and core siblings, no host', async () => {
    const code = `import Papa from 'papaparse';\nimport { z } from 'zod';\nimport { rhoMoistAir } from './physics/air.ts';\nexport const x = [Papa, z, rhoMoistAir];\n`;
    expect(await layering('core/probe.ts', code)).toEqual([]);
  });

  it.each([
    ['events', `import { EventEmitter } from 'events';\nexport const e = EventEmitter;\n`],
    ['fs/promises (a sub-path of a built-in)', `import { readFile } from 'fs/promises';\nexport const r = readFile;\n`],
    ['node:zlib (prefixed)', `import { gzipSync } from 'node:zlib';\nexport const g = gzipSync;\n`],
    ['string_decoder (a less common built-in)', `import { StringDecoder } from 'string_decoder';\nexport const s = StringDecoder;\n`],
    ['electron', `import { app } from 'electron';\nexport const a = app;\n`],
    ['app, by a relative path', `import { x } from '../app/x';\nexport const y = x;\n`],
    ['the renderer, from a nested folder', `import { x } from '../../renderer/src/logic/x.ts';\nexport const y = x;\n`],
    ['a dynamic import of a built-in', `export const load = () => import('node:fs');\n`],
  ])('reports a core import of %s', async (_what, code) => {
    const path = code.includes('../../renderer') ? 'core/physics/probe.ts' : 'core/probe.ts';
    const found = await layering(path, code);
    expect(found.length, code).toBeGreaterThan(0);
    expect(found.every((f) => f.startsWith(code.includes('import(') ? 'no-restricted-syntax' : 'no-restricted-imports'))).toBe(true);
  });

  it.each([
    ['window', `export const w = window.innerWidth;\n`],
    ['document', `export const title = () => document.title;\n`],
    ['localStorage', `export const v = localStorage.getItem('k');\n`],
    ['navigator', `export const lang = navigator.language;\n`],
    ['process', `export const env = process.env['HOME'];\n`],
    ['Buffer', `export const b = Buffer.from('x');\n`],
  ])('reports a core use of the host global %s', async (name, code) => {
    expect(await layering('core/physics/probe.ts', code)).toEqual([expect.stringMatching(new RegExp(`^no-restricted-globals: .*'${name}'`))]);
  });

  it('keeps Node, Electron and app out of the renderer, and core behind its entry', async () => {
    const file = 'renderer/src/logic/probe.ts';
    expect(await layering(file, `import { readFileSync } from 'node:fs';\nexport const r = readFileSync;\n`)).toHaveLength(1);
    expect(await layering(file, `import { ipcRenderer } from 'electron';\nexport const i = ipcRenderer;\n`)).toHaveLength(1);
    expect(await layering(file, `import { x } from '../../../app/electron/ipc.ts';\nexport const y = x;\n`)).toHaveLength(1);
    expect(await layering(file, `import { rhoMoistAir } from '../../../core/physics/air.ts';\nexport const r = rhoMoistAir;\n`)).toEqual([
      expect.stringContaining('core/index.ts'),
    ]);
    expect(
      await layering(file, `import { rhoMoistAir } from '../../../core/index.ts';\nexport const r = rhoMoistAir;\nexport const w = window.innerWidth;\n`),
    ).toEqual([]);
  });

  it('applies the renderer rules to Vue single-file components', async () => {
    const sfc = `<script setup lang="ts">\nimport { readFileSync } from 'fs';\nconst r = readFileSync;\n</script>\n<template><p>{{ r }}</p></template>\n`;
    expect(await layering('renderer/src/components/Probe.vue', sfc)).toHaveLength(1);
  });

  it('keeps the renderer out of app, and core behind its entry', async () => {
    const file = 'app/electron/probe.ts';
    expect(await layering(file, `import { x } from '../../renderer/src/logic/x.ts';\nexport const y = x;\n`)).toHaveLength(1);
    expect(await layering(file, `import { x } from '../../core/reduction/engine.ts';\nexport const y = x;\n`)).toEqual([
      expect.stringContaining('core/index.ts'),
    ]);
    expect(
      await layering(file, `import { readFile } from 'node:fs/promises';\nimport { x } from '../../core/index.ts';\nexport const y = [x, readFile];\n`),
    ).toEqual([]);
  });
});
