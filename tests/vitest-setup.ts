// Every temporary file or folder a test file makes lands in one folder of its own (TMPDIR points
// there, and os.tmpdir() reads TMPDIR), removed when that file's tests are done, so a test run
// leaves nothing behind in the system's temp folder: test stores, databases, bundled workers.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';

const systemTemp = tmpdir();
const folder = mkdtempSync(join(systemTemp, 'fw-vitest-'));
process.env.TMPDIR = folder;

// Registered before any test file's own hooks, so it runs after them (vitest runs after-hooks as a stack).
afterAll(() => {
	process.env.TMPDIR = systemTemp;
	rmSync(folder, { recursive: true, force: true });
});
