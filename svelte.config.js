import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		// Overridable so parallel builds (e.g. the e2e suite and a developer's own build) never share folders.
		adapter: adapter({ out: process.env.FW_BUILD_DIR ?? 'build' }),
		outDir: process.env.FW_KIT_DIR ?? '.svelte-kit',
		// Content Security Policy of every page: scripts only from us, the inline ones with a fresh
		// nonce per response; no framing (clickjacking); forms post only here. Styles allow inline
		// `style` attributes (Svelte's style: directive, uPlot's sized elements); SvelteKit then adds no
		// style nonce. Other headers (nosniff, Referrer-Policy, HSTS): src/lib/server/http/headers.ts.
		csp: {
			mode: 'nonce',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				'font-src': ['self', 'data:'],
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
