// ESLint flat config. Formatting is Prettier's job (`npm run format`); nothing here checks layout.
//
// The import rules keep the layers of DEVELOPERS.md pointing down:
//   pages, features → server or domain → engine;   only src/server (and db/, scripts/, tests/) reach db/.
import { defineConfig } from 'eslint/config';
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import astro from 'eslint-plugin-astro';
import reactHooks from 'eslint-plugin-react-hooks';
import jsxA11y from 'eslint-plugin-jsx-a11y';
import importX, { createNodeResolver } from 'eslint-plugin-import-x';
import globals from 'globals';

const CODE = ['**/*.{js,mjs,ts,tsx,astro}'];

/** Everything of ours outside the engine (tests/unit/engine and tests/reference may test engine internals). */
const OUTSIDE_ENGINE = [
  'src/!(engine)/**',
  'src/*.*',
  'db/**',
  'scripts/**',
  '*.{js,mjs,ts}',
  'tests/*.*',
  'tests/!(unit|reference)/**',
  'tests/unit/!(engine)/**',
  'tests/unit/*.*',
];

/** Source folders that are neither the server nor the database layer: they never import db/. */
const OUTSIDE_SERVER = ['src/!(server)/**', 'src/*.*'];

/** Our settings of two accessibility rules, for .tsx and (prefixed astro/) for .astro templates. */
const A11Y_OPTIONS = (prefix) => ({
  // A labelled scrolling region must take keyboard focus so it can be scrolled without a mouse (WCAG 2.1.1).
  [`${prefix}no-noninteractive-tabindex`]: ['error', { tags: [], roles: ['tabpanel', 'region'], allowExpressionValues: true }],
  // `role="list"` on a styled list is deliberate: Safari drops list semantics when list-style is none.
  [`${prefix}no-redundant-roles`]: ['error', { ul: ['list'], ol: ['list'] }],
});

const zones = [
  {
    target: './src/engine',
    from: './src',
    except: ['./engine'],
    message: 'The engine is pure: it imports nothing of ours outside src/engine.',
  },
  {
    target: './src/engine',
    from: ['./db', './scripts', './tests'],
    message: 'The engine is pure: it imports nothing of ours outside src/engine.',
  },
  {
    target: './src/domain',
    from: ['./src/server', './src/features', './src/pages', './src/components', './src/middleware.ts', './db'],
    message: 'Domain rules have no I/O: they import only the engine, src/lib and libraries.',
  },
  {
    target: './src/lib',
    from: ['./src/server', './src/features', './src/pages', './src/components', './src/domain', './src/middleware.ts', './db'],
    message: 'src/lib sits under every layer (formatters, units, clients): it imports only the engine and libraries.',
  },
  {
    target: './src/server',
    from: ['./src/features', './src/pages', './src/components', './src/middleware.ts'],
    message: 'Imports point down: the server never imports pages, islands, UI components or the middleware.',
  },
  {
    target: './src/components/ui',
    from: ['./src/features', './src/pages', './src/server', './db'],
    message: 'Shared UI primitives know no feature, page or server module: pass what they need as props.',
  },
  {
    target: OUTSIDE_SERVER,
    from: './db',
    message: 'Only src/server reaches the database layer (db/); go through a src/server module.',
  },
  {
    target: OUTSIDE_ENGINE,
    from: './src/engine',
    except: ['./index.ts', './light.ts'],
    message: "Import the engine through its doors only: src/engine/index.ts ('…/engine'), or src/engine/light.ts for light islands.",
  },
  {
    target: './db/migrations',
    from: ['./src', './db', './scripts', './tests'],
    except: ['./migrations'],
    message: 'Migrations are frozen in time: they never import app code or db/schema.',
  },
  {
    target: ['./db/client.ts', './db/schema.ts', './db/migrate.ts'],
    from: './src',
    message: 'The database layer never imports the app (seeding lives in scripts/).',
  },
];

export default defineConfig(
  {
    ignores: ['node_modules/', 'dist/', '.dist*/', '.astro/', 'db/data/', 'db/backups/', 'test-results/', 'public/'],
  },
  {
    linterOptions: { reportUnusedDisableDirectives: 'error' },
  },
  { files: CODE, ...js.configs.recommended },
  ...tseslint.configs.recommended.map((c) => ({ ...c, files: c.files ?? CODE })),
  ...astro.configs['flat/recommended'],
  {
    files: CODE,
    languageOptions: {
      ecmaVersion: 'latest',
      sourceType: 'module',
      globals: { ...globals.node, ...globals.browser },
    },
    plugins: { 'import-x': importX },
    settings: {
      'import-x/extensions': ['.js', '.mjs', '.ts', '.tsx', '.astro'],
      // Parse each imported file with its own parser (an .astro page importing a .ts module, and back).
      'import-x/parsers': { '@typescript-eslint/parser': ['.ts', '.tsx', '.mjs', '.js'], 'astro-eslint-parser': ['.astro'] },
      'import-x/resolver-next': [createNodeResolver({ extensions: ['.ts', '.tsx', '.js', '.mjs', '.astro', '.json', '.d.ts'] })],
    },
    rules: {
      'import-x/no-restricted-paths': ['error', { zones }],
      // "No circle" in the import graph; type-only imports vanish at run time and are not counted.
      'import-x/no-cycle': ['error', { ignoreExternal: true }],
      'import-x/no-self-import': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none', ignoreRestSiblings: true }],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports', disallowTypeAnnotations: false }],
    },
  },
  {
    // The engine is pure: no framework, database, clock source or Node-only module.
    files: ['src/engine/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['node:*', 'astro', 'astro:*', 'astro/*', '@astrojs/*', 'react', 'react-dom', 'react/*', 'kysely', 'better-sqlite3', 'better-auth', 'better-auth/*'],
              message: 'The engine is pure: no framework, database or Node-only imports.',
            },
          ],
        },
      ],
      // …and no clock or randomness: the same plan always gives the same forecast.
      'no-restricted-properties': [
        'error',
        { object: 'Date', property: 'now', message: 'The engine reads no clock: take the time as an input.' },
        { object: 'Math', property: 'random', message: 'The engine is deterministic: no randomness.' },
        { object: 'performance', property: 'now', message: 'The engine reads no clock: take the time as an input.' },
      ],
      'no-restricted-syntax': ['error', { selector: "NewExpression[callee.name='Date'][arguments.length=0]", message: 'The engine reads no clock: `new Date()` is now; pass the time in.' }],
    },
  },
  {
    // Migrations are typed Kysely<any> on purpose (frozen in time, never the app's table types);
    // tests read untyped JSON from the server under test and assert its shape; .d.ts files describe untyped packages.
    files: ['db/migrate.ts', 'db/migrations/**', 'tests/**', '**/*.d.ts'],
    ignores: ['tests/unit/engine/**', 'tests/reference/**'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
  {
    // Astro's own env.d.ts points at its generated types with a triple-slash reference.
    files: ['src/env.d.ts'],
    rules: { '@typescript-eslint/triple-slash-reference': 'off' },
  },
  {
    files: ['**/*.tsx'],
    ...reactHooks.configs.flat['recommended-latest'],
  },
  {
    // The rules of hooks are errors. The React Compiler's diagnostics are warnings: we do not run the
    // compiler, so they point at code worth a look rather than at bugs (turn them up if we adopt it).
    files: ['**/*.tsx'],
    rules: Object.fromEntries(
      Object.keys(reactHooks.configs.flat['recommended-latest'].rules)
        .filter((rule) => rule !== 'react-hooks/rules-of-hooks')
        .map((rule) => [rule, 'warn']),
    ),
  },
  {
    files: ['**/*.tsx'],
    plugins: { 'jsx-a11y': jsxA11y },
    languageOptions: jsxA11y.flatConfigs.recommended.languageOptions,
    rules: {
      ...jsxA11y.flatConfigs.recommended.rules,
      ...A11Y_OPTIONS('jsx-a11y/'),
    },
  },
  // The same accessibility rules inside .astro templates (eslint-plugin-astro wraps jsx-a11y's rules as astro/*).
  {
    files: ['**/*.astro'],
    rules: {
      ...astro.configs['flat/jsx-a11y-recommended'].at(-1).rules,
      ...A11Y_OPTIONS('astro/jsx-a11y/'),
    },
  },
);
