import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: adapter(),
		// The cross-site check for form submissions runs in our hooks (src/lib/server/hooks/guards.ts):
		// the same rule as SvelteKit's, plus the RFC 8058 one-click unsubscribe, which a mail client
		// posts from no page at all.
		csrf: { trustedOrigins: ['*'] },
		// Pages load scripts, styles, fonts and images from this site only; images may also be data:
		// URIs (placeholders). Markdown images from other hosts are dropped by the sanitizer and would be
		// blocked here too, so readers' addresses never reach outsiders.
		// Hash mode: inline scripts are allowed by their hash, so a page's HTML is the same for every
		// request and the reader cache can serve it again (a nonce must never be reused).
		csp: {
			mode: 'hash',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:'],
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
