import js from '@eslint/js';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

export default ts.config(
	{ ignores: ['build/', '.svelte-kit/', '.data/', 'node_modules/'] },
	js.configs.recommended,
	...ts.configs.recommended,
	...svelte.configs.recommended,
	{ languageOptions: { globals: { ...globals.browser, ...globals.node } } },
	{
		files: ['**/*.svelte', '**/*.svelte.ts'],
		languageOptions: { parserOptions: { projectService: true, extraFileExtensions: ['.svelte'], parser: ts.parser, svelteConfig } }
	},
	// Layering, enforced: the numeric core and the domain vocabulary import nothing from
	// the server, SvelteKit, Svelte, the database or the DOM; they and the folders worker
	// threads load use relative imports only (threads have no $lib alias).
	{
		files: ['src/lib/numerics/**/*.ts', 'src/lib/domain/**/*.ts'],
		rules: {
			'no-restricted-imports': [
				'error',
				{
					patterns: [
						{ group: ['$lib', '$lib/*', '$app/*', '$env/*'], message: 'numerics and domain use relative imports only (worker threads load them without the $lib alias)' },
						{ group: ['**/server', '**/server/**', '@sveltejs/*', 'svelte', 'svelte/*', 'knex', 'pg', 'pg-boss'], message: 'numerics and domain import nothing from the server, SvelteKit, Svelte or the database' }
					]
				}
			],
			'no-restricted-globals': ['error', { name: 'window', message: 'numerics and domain run without a DOM' }, { name: 'document', message: 'numerics and domain run without a DOM' }]
		}
	},
	{
		files: ['src/lib/server/offload/**/*.ts', 'src/lib/server/studies/**/*.ts', 'src/lib/server/datasets/**/*.ts'],
		rules: {
			'no-restricted-imports': ['error', { patterns: [{ group: ['$lib', '$lib/*', '$app/*', '$env/*'], message: 'code loaded by worker threads uses relative imports only (threads have no $lib alias)' }] }]
		}
	},
	{
		rules: {
			'@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', destructuredArrayIgnorePattern: '^_' }],
			'svelte/no-navigation-without-resolve': 'off'
		}
	}
);
