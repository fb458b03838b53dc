// Issue 10, finding 12 (the unit half): the shutdown registry closes every registered part, newest
// first, once, and a part that hangs or fails does not stop the others. The end-to-end half (the
// built server in demo mode ends on SIGTERM and SIGINT within 10 s) is tests/e2e/operations.e2e.ts.
import { afterEach, describe, expect, it } from 'vitest';
import { onShutdown, resetShutdownForTests, shutdown } from './shutdown';

afterEach(resetShutdownForTests);

describe('shutdown', () => {
	it('closes newest first, each once, even when called twice', async () => {
		const closed: string[] = [];
		onShutdown('database', () => void closed.push('database'));
		onShutdown('mail', async () => void closed.push('mail'));
		onShutdown('workers', () => void closed.push('workers'));
		await Promise.all([shutdown(), shutdown()]);
		expect(closed).toEqual(['workers', 'mail', 'database']);
	});

	it('goes on past a close that fails or hangs, and says so', async () => {
		const closed: string[] = [];
		const lines: string[] = [];
		onShutdown('database', () => void closed.push('database'));
		onShutdown('stuck', () => new Promise<void>(() => {}));
		onShutdown('broken', () => {
			throw new Error('socket gone');
		});
		const started = Date.now();
		await shutdown({ timeoutMs: 50, log: (line) => lines.push(line) });
		expect(Date.now() - started).toBeLessThan(2000);
		expect(closed).toEqual(['database']);
		expect(lines).toEqual([
			'Stopping: closing broken failed: socket gone',
			'Stopping: stuck did not close within 50 ms'
		]);
	});

	it('an unregistered part is not closed', async () => {
		const closed: string[] = [];
		const off = onShutdown('early', () => void closed.push('early'));
		off();
		await shutdown();
		expect(closed).toEqual([]);
	});
});
