import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	// fmin's package entry is a UMD build under "type": "module"; bundling it
	// from source works in dev, build, SSR and vitest alike.
	ssr: { noExternal: ['fmin'] },
	test: {
		projects: [
			{
				extends: true,
				test: {
					name: 'unit',
					include: ['src/**/*.spec.ts', 'tests/unit/**/*.test.ts'],
					environment: 'node',
					testTimeout: 60_000
				}
			},
			{
				extends: true,
				test: {
					name: 'integration',
					include: ['tests/integration/**/*.test.ts'],
					environment: 'node',
					testTimeout: 60_000,
					hookTimeout: 120_000,
					fileParallelism: false
				}
			},
			{
				extends: true,
				test: {
					name: 'e2e',
					include: ['tests/e2e/**/*.test.ts'],
					environment: 'node',
					testTimeout: 120_000,
					hookTimeout: 180_000,
					fileParallelism: false
				}
			}
		]
	}
});
