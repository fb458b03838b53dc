import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		// Overridable so parallel builds (e.g. the e2e suite and a developer's own build) never share folders.
		adapter: adapter({ out: process.env.FW_BUILD_DIR ?? 'build' }),
		outDir: process.env.FW_KIT_DIR ?? '.svelte-kit'
	}
};

export default config;
