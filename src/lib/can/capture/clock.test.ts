// Wall-clock readings of frame times. References: Date.UTC (ECMAScript) for date-times, and the
// plain arithmetic of a 24-hour clock (86 400 s a day) for times of day.
import { describe, expect, it } from 'vitest';
import { formatClock, hasClock, isoClock, originOf, withClockColumn } from './clock';

describe('capture clock', () => {
	it('reads a time of day as the clock did, marking the day after midnight', () => {
		const origin = originOf('time-of-day', false, 14 * 3600 + 3 * 60 + 7.25);
		expect(formatClock(origin, 0)).toBe('14:03:07.250');
		expect(origin.seconds).toBe(50_587.25);
		expect(formatClock(origin, 0.5)).toBe('14:03:07.750');
		// 23:59:59.950 plus 0.08 s is 00:00:00.030 of the next day.
		const late = originOf('time-of-day', false, 86_399.95);
		expect(formatClock(late, 0)).toBe('23:59:59.950');
		expect(formatClock(late, 0.08)).toBe('00:00:00.030 +1 d');
		expect(formatClock(late, 0.08, { digits: 6 })).toBe('00:00:00.030000 +1 d');
		expect(isoClock(late, 0)).toBe('23:59:59.950000');
	});

	it('carries a fraction that rounds up into the next second', () => {
		const origin = originOf('time-of-day', false, 59.9996);
		expect(formatClock(origin, 0)).toBe('00:01:00.000');
	});

	it('reads a date-time against Date.UTC, in UTC', () => {
		const seconds = Date.UTC(2026, 2, 4, 14, 3, 7, 250) / 1000;
		const origin = originOf('date-time', false, seconds);
		expect(formatClock(origin, 0)).toBe('2026-03-04 14:03:07.250 UTC');
		expect(formatClock(origin, 0, { timeOnly: true })).toBe('14:03:07.250');
		// Over midnight on the last day of February 2026 (not a leap year) into March.
		const feb = originOf('number', true, Date.UTC(2026, 1, 28, 23, 59, 59, 900) / 1000);
		expect(formatClock(feb, 0.2)).toBe('2026-03-01 00:00:00.100 UTC');
		expect(isoClock(feb, 0.2)).toBe('2026-03-01T00:00:00.100000Z');
	});

	it('has nothing to show for relative times', () => {
		const origin = originOf('number', false, 12.5);
		expect(hasClock(origin)).toBe(false);
		expect(formatClock(origin, 1)).toBeNull();
		expect(isoClock(origin, 1)).toBe('');
	});
});

describe('exports with a clock column', () => {
	it('adds the ISO 8601 clock to every record, whatever the pieces, quoted line breaks kept', async () => {
		const origin = originOf('date-time', false, Date.UTC(2026, 2, 4, 14, 3, 7, 250) / 1000);
		const csv = 'time,frame,signal,value,unit\n0,A,"two\nlines",1,V\n0.5,A,x,2,V\n';
		async function* cut(size: number) {
			for (let i = 0; i < csv.length; i += size) yield csv.slice(i, i + size);
		}
		const expected =
			'time,frame,signal,value,unit,clock\n' +
			'0,A,"two\nlines",1,V,2026-03-04T14:03:07.250000Z\n' +
			'0.5,A,x,2,V,2026-03-04T14:03:07.750000Z\n';
		for (const size of [1, 3, 7, csv.length]) {
			let out = '';
			for await (const piece of withClockColumn(cut(size), origin)) out += piece;
			expect(out).toBe(expected);
		}
	});
});
