// ESLint flat config (kept under scripts/ so the top level stays as the architecture fixes it).
import fs from 'node:fs';
import path from 'node:path';
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import pluginQuery from '@tanstack/eslint-plugin-query';
import importPlugin from 'eslint-plugin-import';
import globals from 'globals';

const root = path.resolve(import.meta.dirname, '..');
const abs = (glob) => path.join(root, glob);
const features = fs
  .readdirSync(path.join(root, 'src/features'), { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => d.name);

/**
 * The import direction of docs/architecture.md. Each zone forbids `target` files to import
 * `from` files; a layer may import the layers below it, never those above or beside it.
 */
const importZones = [
  // Client: app -> features -> components, lib, config -> shared.
  { target: 'src/features', from: 'src/app', message: 'Features sit below the app; pass what they need as props or move it down.' },
  { target: ['src/components', 'src/lib', 'src/config'], from: ['src/features', 'src/app'], message: 'Shared client code may not import features or the app.' },
  ...features.map((f) => ({
    target: `src/features/${f}`,
    from: 'src/features',
    except: [`./${f}`],
    message: 'A feature may not import another feature; move the shared piece down into src/components, src/lib or shared/.',
  })),
  { target: 'src', from: ['server', 'migrations', 'seed'], message: 'The client talks to the server over HTTP only.' },
  // Shared code is pure and used by both sides.
  { target: 'shared', from: ['src', 'server', 'migrations', 'seed'], message: 'shared/ imports neither the client nor the server.' },
  { target: 'server', from: 'src', message: 'The server may not import client code.' },
  // Server: routes -> services -> entities; jobs sit above modules and call their services.
  { target: 'server/modules', from: 'server/jobs', message: 'Modules may not import jobs; the job calls the module’s service instead.' },
  {
    target: ['server/http', 'server/mail'],
    from: ['server/modules', 'server/jobs'],
    except: ['./common'],
    message: 'server/http and server/mail sit below the modules.',
  },
  {
    target: [abs('server/!(app).ts'), abs('server/*/**/!(*.routes).ts')],
    from: [abs('server/**/*.routes.ts')],
    message: 'Only server/app.ts registers routes; services, entities and jobs never import a routes file.',
  },
  { target: abs('server/app.ts'), from: [abs('server/**/*.entity.ts')], message: 'server/app.ts wires routes; queries belong in a service.' },
  {
    target: abs('server/**/*.routes.ts'),
    from: [abs('server/**/*.entity.ts')],
    message: 'A routes file calls a service; queries on entities belong in the service.',
  },
  {
    target: abs('server/**/*.entity.ts'),
    from: [abs('server/**/*.ts')],
    except: [abs('server/**/*.entity.ts'), abs('server/modules/common/**')],
    message: 'An entity imports only other entities and the common base.',
  },
];

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**', 'test-results/**', 'tests/e2e/artifacts/**', 'playwright-report/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  ...pluginQuery.configs['flat/recommended'],
  {
    files: ['**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { 'react-hooks': reactHooks },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/no-explicit-any': 'warn',
    },
  },
  {
    files: ['src/**/*.{ts,tsx}', 'server/**/*.ts', 'shared/**/*.ts'],
    plugins: { import: importPlugin },
    // Imports are extensionless relative paths; the node resolver finds the .ts/.tsx file.
    settings: { 'import/resolver': { node: { extensions: ['.ts', '.tsx', '.js'] } } },
    rules: { 'import/no-restricted-paths': ['error', { basePath: root, zones: importZones }] },
  },
  {
    files: ['**/*.js'],
    languageOptions: { globals: globals.node },
  },
);
