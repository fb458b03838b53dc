import { defineConfig } from '@playwright/test';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

// Fixed test ports, away from the defaults a developer's own server uses (3000 / 2525);
// overridable so two suites (say, a clean-checkout CI rehearsal and a developer's run) can run at once.
const PORT = Number(process.env.E2E_PORT ?? 4173);
const STANDIN_SMTP_PORT = Number(process.env.E2E_SMTP_PORT ?? 2626);
const baseURL = `http://localhost:${PORT}`;

// A folder that cannot exist yet, holding the database and the capture store: every run starts
// from an empty, freshly migrated database and an empty store, never the developer's data/. Workers
// re-evaluate this file; the environment carries the one name to them (only the main process starts
// the web server). tests/e2e/global-teardown.ts removes the folder after the run.
process.env.FW_E2E_DATA ??= join(tmpdir(), `framewright-e2e-${process.pid}-${Date.now()}`);
const dataFolder = process.env.FW_E2E_DATA;
const databasePath = join(dataFolder, 'framewright.db');
const storageRoot = join(dataFolder, 'storage');

export default defineConfig({
	testDir: 'tests/e2e',
	testMatch: '**/*.e2e.ts',
	workers: 1,
	fullyParallel: false,
	forbidOnly: !!process.env.CI,
	retries: 0,
	timeout: 60_000,
	expect: { timeout: 10_000 },
	reporter: process.env.CI ? [['list'], ['html', { open: 'never' }]] : 'list',
	globalTeardown: './tests/e2e/global-teardown.ts',
	use: {
		baseURL,
		trace: 'retain-on-failure',
		screenshot: 'only-on-failure',
		launchOptions: {
			// Debian's Chromium; the suite never downloads a browser (`playwright install` is not used).
			executablePath: '/usr/bin/chromium',
			args: [
				'--no-sandbox',
				'--disable-gpu',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync',
				'--no-first-run'
			]
		}
	},
	projects: [{ name: 'chromium', use: { browserName: 'chromium' } }],
	webServer: {
		// The production build, served the way `npm start` serves it.
		command: 'npm run build && node scripts/serve.js',
		url: baseURL,
		reuseExistingServer: false,
		timeout: 300_000,
		stdout: 'ignore',
		stderr: 'pipe',
		// Stopped the way a service manager stops it; the server ends by itself (shutdown.ts).
		gracefulShutdown: { signal: 'SIGTERM', timeout: 10_000 },
		env: {
			PORT: String(PORT),
			ORIGIN: baseURL,
			DATABASE_PATH: databasePath,
			STORAGE_ROOT: storageRoot,
			FRAMEWRIGHT_DEMO: '1',
			SMTP_HOST: '',
			STANDIN_SMTP_PORT: String(STANDIN_SMTP_PORT),
			AUTH_TRUST_HOST: 'true',
			AUTH_SECRET: 'e2e-only-secret-not-for-production-0123456789abcdef',
			// The journeys sign the same demo accounts in many times within the hour; the per-address
			// limit itself is proven by the unit tests (src/lib/server/auth.test.ts).
			SIGNIN_LINKS_PER_HOUR: '1000',
			// Likewise every journey signs in and invites from 127.0.0.1; the per-client and per-account
			// limits are proven by src/lib/server/mail/mail-abuse.test.ts.
			SIGNIN_REQUESTS_PER_CLIENT_PER_HOUR: '1000',
			INVITATIONS_PER_ACCOUNT_PER_HOUR: '1000',
			INVITATIONS_PER_CLIENT_PER_HOUR: '1000'
		}
	}
});
