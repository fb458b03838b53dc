// The lint set a SvelteKit project starts with: ESLint's and typescript-eslint's recommended rules,
// the Svelte plugin's, and Prettier owning the layout (https://svelte.dev/docs/cli/eslint).
import js from '@eslint/js';
import prettier from 'eslint-config-prettier';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

export default ts.config(
	{
		ignores: [
			'build/',
			'.svelte-kit/',
			'node_modules/',
			'data/',
			'test-results/',
			'playwright-report/',
			'bench/out/',
			'.build-*/',
			'.kit-*/'
		]
	},
	js.configs.recommended,
	...ts.configs.recommended,
	...svelte.configs.recommended,
	prettier,
	...svelte.configs.prettier,
	{
		languageOptions: { globals: { ...globals.browser, ...globals.node } },
		rules: {
			// TypeScript already checks undefined names, better than this rule can (typescript-eslint's advice).
			'no-undef': 'off',
			'@typescript-eslint/no-unused-vars': [
				'error',
				{ argsIgnorePattern: '^_', varsIgnorePattern: '^_' }
			],
			// The app is served at the root (no `paths.base`) and builds its links with small path helpers
			// (e.g. `mapPaths`), which this rule cannot follow.
			'svelte/no-navigation-without-resolve': 'off'
		}
	},
	{
		// Migrations run against `Kysely<any>` so they never depend on today's Database type (Kysely's
		// own advice: https://kysely.dev/docs/migrations).
		files: ['db/migrations/**', 'src/lib/server/db/migrate.ts'],
		rules: { '@typescript-eslint/no-explicit-any': 'off' }
	},
	{
		files: ['**/*.svelte', '**/*.svelte.ts', '**/*.svelte.js'],
		languageOptions: {
			parserOptions: {
				projectService: true,
				extraFileExtensions: ['.svelte'],
				parser: ts.parser,
				svelteConfig
			}
		}
	}
);
