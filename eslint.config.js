// ESLint: typescript-eslint and eslint-plugin-vue, plus the layering rules of docs/architecture.md §1.
// The layering rules are the point of this file; test/unit/lint-layers.test.ts proves each one fires.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import pluginVue from 'eslint-plugin-vue';
import globals from 'globals';
import { builtinModules } from 'node:module';

const escape = (s) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
/**
 * Every Node built-in, bare, `node:`-prefixed or with a sub-path (fs/promises), from Node's own list,
 * so a built-in added to Node is covered too.
 */
const nodeBuiltin = {
  regex: `^(node:.*|(${builtinModules
    .filter((m) => !m.startsWith('node:'))
    .map(escape)
    .join('|')})(/.*)?)$`,
  message: 'a Node built-in',
};
const electron = { regex: '^electron(/.*)?$', message: 'Electron belongs to app/electron' };
const relativeInto = (folder) => `^(\\.\\.?/)+(\\.\\./)*${folder}(/.*)?$`;
/** core is reached through its one public entry (core/index.ts) from outside core. */
const coreOnlyByIndex = { regex: '^(\\.\\.?/)+(\\.\\./)*core/(?!index\\.ts$).*$', message: 'import core through core/index.ts' };

/** The no-restricted-imports rule with these patterns. */
const restrictImports = (...patterns) => ['error', { patterns }];

/** Globals of a browser page or of Node that the pure core must not touch (it runs in both hosts and in a worker). */
const HOST_GLOBALS = [
  'window',
  'document',
  'navigator',
  'location',
  'localStorage',
  'sessionStorage',
  'indexedDB',
  'history',
  'alert',
  'confirm',
  'prompt',
  'fetch',
  'XMLHttpRequest',
  'WebSocket',
  'Worker',
  'self',
  'postMessage',
  'Blob',
  'File',
  'FileReader',
  'URL',
  'performance',
  'crypto',
  'process',
  'Buffer',
  'require',
  'module',
  '__dirname',
  '__filename',
  'global',
  'setImmediate',
].map((name) => ({ name, message: 'core is pure: no browser or Node globals (docs/architecture.md §1)' }));

export default tseslint.config(
  { ignores: ['dist/**', 'out/**', 'node_modules/**', 'test-artifacts/**', '.bench/**', 'bin/**', 'test/fixtures/**/*.py'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  ...pluginVue.configs['flat/recommended'],
  {
    languageOptions: { ecmaVersion: 2023, sourceType: 'module', globals: { ...globals.node, ...globals.browser } },
    rules: {
      // `_name` marks a parameter kept for its position in a signature
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }],
      // non-null assertions follow an index check that noUncheckedIndexedAccess cannot see
      '@typescript-eslint/no-non-null-assertion': 'off',
      // short-circuit statements (`ok && push(x)`) and comma sequences are used on hot paths of the reader
      '@typescript-eslint/no-unused-expressions': ['error', { allowShortCircuit: true, allowTernary: true }],
      'no-constant-condition': ['error', { checkLoops: false }],
    },
  },
  {
    files: ['**/*.vue'],
    languageOptions: { parserOptions: { parser: tseslint.parser, extraFileExtensions: ['.vue'] }, globals: globals.browser },
    rules: {
      // formatting is Prettier's job; these layout rules would fight it
      // single-word component names (Toolbar) collide with no HTML element here; renaming would churn the views
      'vue/multi-word-component-names': 'off',
      'vue/max-attributes-per-line': 'off',
      'vue/singleline-html-element-content-newline': 'off',
      'vue/multiline-html-element-content-newline': 'off',
      'vue/html-self-closing': 'off',
      'vue/html-indent': 'off',
      'vue/html-closing-bracket-newline': 'off',
      'vue/attributes-order': 'off',
    },
  },
  // Layer: core — pure TypeScript, runs in Node, a browser page and a worker alike
  {
    files: ['core/**/*.ts'],
    languageOptions: { globals: {} },
    rules: {
      'no-restricted-imports': restrictImports(
        nodeBuiltin,
        electron,
        { regex: relativeInto('(app|renderer)'), message: 'core must not depend on app or renderer' },
        { regex: '^(vue|chart\\.js)(/.*)?$', message: 'view libraries belong to the renderer' },
      ),
      'no-restricted-globals': ['error', ...HOST_GLOBALS],
      // a dynamic import() escapes no-restricted-imports, and core has no use for one
      'no-restricted-syntax': ['error', { selector: 'ImportExpression', message: 'core imports statically, so the layering rules see every import' }],
    },
  },
  // Layer: renderer — the page; reaches files only through the host interface
  {
    files: ['renderer/**/*.ts', 'renderer/**/*.vue'],
    languageOptions: { globals: globals.browser },
    rules: {
      'no-restricted-imports': restrictImports(
        nodeBuiltin,
        electron,
        { regex: relativeInto('app'), message: 'the renderer reaches its host only through the host interface' },
        coreOnlyByIndex,
      ),
    },
  },
  // Layer: app — the hosts (command line, Electron main and preload, static server)
  {
    files: ['app/**/*.ts', 'app/**/*.cts'],
    languageOptions: { globals: globals.node },
    rules: {
      'no-restricted-imports': restrictImports({ regex: relativeInto('renderer'), message: 'app must not import the renderer' }, coreOnlyByIndex),
    },
  },
  // Tests build arbitrary JSON on purpose and load the renderer's ambient declarations by reference
  { files: ['test/**/*.ts'], rules: { '@typescript-eslint/no-explicit-any': 'off', '@typescript-eslint/triple-slash-reference': 'off' } },
  // CommonJS entry points and plain scripts
  { files: ['**/*.cjs', '**/*.cts'], rules: { '@typescript-eslint/no-require-imports': 'off' } },
);
