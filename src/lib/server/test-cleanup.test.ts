// Issue 10, finding 15: the test runs left their temporary databases and capture stores behind in
// the system's temp folder. Every temporary folder a test file makes is now inside one folder of
// its own (tests/vitest-setup.ts), removed after the file; the Playwright suite's database and
// store are removed by tests/e2e/global-teardown.ts.
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, dirname } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createTestServices } from './test-support';

describe('tests keep their temporary files in a folder removed afterwards', () => {
	it("a test store lives in this file's own temporary folder", async () => {
		const services = await createTestServices();
		expect(basename(tmpdir())).toMatch(/^fw-vitest-/);
		expect(dirname(services.storageRoot)).toBe(tmpdir());
		expect(existsSync(services.storageRoot)).toBe(true);
	});
});
