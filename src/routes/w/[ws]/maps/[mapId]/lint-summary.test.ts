import { describe, expect, it } from 'vitest';
import { lintMap } from '$lib/can/lint';
import { canMapSchema } from '$lib/can/map';
import { countBySeverity, describeCount, lintByFrame } from './lint-summary';

// Two overlapping 16-bit fields in frame 1 (bits 0–15 and 8–23): the core lint reports an overlap there.
const map = canMapSchema.parse({
	format: 'framewright-map@1',
	name: 'Bench',
	frames: [
		{ name: 'Clean', id: '0x100', signals: [{ name: 'A', startBit: 0, length: 8 }] },
		{
			name: 'Clashing',
			id: '0x101',
			signals: [
				{ name: 'Rpm', startBit: 0, length: 16 },
				{ name: 'Load', startBit: 8, length: 16 }
			]
		}
	]
});

describe('lint summary', () => {
	it('counts the problems of the frame that has them, and none for a clean frame', () => {
		const problems = lintMap(map);
		const perFrame = lintByFrame(problems);
		expect(perFrame.get(0)).toBeUndefined();
		expect(perFrame.get(1)?.errors).toBeGreaterThanOrEqual(1);
		expect(countBySeverity(problems).errors).toBe(perFrame.get(1)?.errors);
	});

	it.each([
		[{ errors: 0, warnings: 0 }, 'No problems'],
		[{ errors: 1, warnings: 0 }, '1 error'],
		[{ errors: 2, warnings: 1 }, '2 errors, 1 warning']
	])('describes %o as "%s"', (count, text) => {
		expect(describeCount(count)).toBe(text);
	});
});
