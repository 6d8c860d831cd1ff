import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: adapter({ out: 'build' }),
		// The origin check is done in hooks.server.ts instead, so that requests
		// authenticated by an API token (no ambient credential) are exempt.
		csrf: { trustedOrigins: ['*'] }
	}
};

export default config;
