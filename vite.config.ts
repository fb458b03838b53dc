import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	test: {
		include: ['src/**/*.test.ts', 'tests/unit/**/*.test.ts', 'db/**/*.test.ts'],
		environment: 'node',
		setupFiles: ['tests/vitest-setup.ts'],
		expect: { requireAssertions: true },
		testTimeout: 30_000
	}
});
