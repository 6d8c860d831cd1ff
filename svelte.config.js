import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: adapter({ out: 'build' }),
		// The origin check is done in hooks.server.ts instead, so that requests
		// authenticated by an API token (no ambient credential) are exempt.
		csrf: { trustedOrigins: ['*'] },
		// Content policy of every page: scripts only from this origin, SvelteKit's own
		// inline start-up script allowed by hash or nonce (never 'unsafe-inline' scripts).
		// Inline styles stay allowed: Svelte's style: directives and the charts' SVG use them.
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				'font-src': ['self'],
				'connect-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
