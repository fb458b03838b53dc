import { describe, expect, it } from 'vitest';
import { percentText, pollUntilSettled, type StatusAnswer } from './poll-status';

const noWait = async () => {};

function scripted(steps: (StatusAnswer | Error)[]) {
	let k = 0;
	return async () => {
		const step = steps[Math.min(k++, steps.length - 1)];
		if (step instanceof Error) throw step;
		return step;
	};
}

const at = (
	status: StatusAnswer['status'],
	progress: number,
	error: string | null = null
): StatusAnswer => ({ status, progress, error });

describe('pollUntilSettled', () => {
	it('reports each answer until the capture is ready', async () => {
		const seen: number[] = [];
		const final = await pollUntilSettled(
			scripted([at('uploaded', 0), at('processing', 0.4), at('processing', 0.9), at('ready', 1)]),
			{
				sleep: noWait,
				onupdate: (a) => seen.push(a.progress)
			}
		);
		expect(final.status).toBe('ready');
		expect(seen).toEqual([0, 0.4, 0.9, 1]);
	});

	it('a failed processing settles with its error', async () => {
		const final = await pollUntilSettled(
			scripted([at('processing', 0.2), at('failed', 0.2, 'line 1: not a capture')]),
			{ sleep: noWait }
		);
		expect(final).toEqual(at('failed', 0.2, 'line 1: not a capture'));
	});

	it('rides out a passing network error but gives up after repeated ones', async () => {
		const recovered = await pollUntilSettled(scripted([new Error('offline'), at('ready', 1)]), {
			sleep: noWait
		});
		expect(recovered.status).toBe('ready');
		await expect(
			pollUntilSettled(scripted([new Error('offline')]), { sleep: noWait, maxFailures: 3 })
		).rejects.toThrow('offline');
	});

	it('stops when aborted', async () => {
		const controller = new AbortController();
		controller.abort();
		await expect(
			pollUntilSettled(scripted([at('processing', 0)]), {
				sleep: noWait,
				signal: controller.signal
			})
		).rejects.toThrow(/Stopped/);
	});

	it('writes fractions as clamped whole percentages', () => {
		expect([percentText(0.424), percentText(1.2), percentText(-1)]).toEqual([
			'42 %',
			'100 %',
			'0 %'
		]);
	});
});
