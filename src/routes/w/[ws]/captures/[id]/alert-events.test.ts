import { describe, expect, it } from 'vitest';
import type { ReplayedEvent } from '$lib/can/alerts/replay';
import { alertMarkers, parseAckTime, timelineSpan } from './alert-events';

// Demo event (invented), shaped like the alerts route's answer.
const event: ReplayedEvent = {
	rule: 'oil',
	ruleName: 'Oil pressure low',
	severity: 'critical',
	start: 10,
	end: null,
	peak: 170,
	duration: 50,
	latched: true,
	acknowledgedAt: null,
	returnedAt: 12,
	channelIndex: 3,
	message: 'Oil pressure low: 170 kPa'
};

describe('alert events helpers', () => {
	it('turns events into plot markers named by rule and severity word', () => {
		expect(alertMarkers([event])).toEqual([
			{ time: 10, endTime: null, label: 'Oil pressure low (Critical)', severity: 'critical' }
		]);
	});

	it('places an open event up to the end of the recording, and keeps a short event visible', () => {
		expect(timelineSpan(event, 40)).toEqual({ left: 25, width: 75 });
		expect(timelineSpan({ start: 20, end: 20.001 }, 40)).toEqual({ left: 50, width: 0.5 });
	});

	it('accepts an acknowledgement time within the event and the recording, explaining refusals', () => {
		expect(parseAckTime('12,5', event, { endTime: 60 })).toBe(12.5);
		expect(parseAckTime('9', event, { endTime: 60 })).toBe(
			'the event starts at 10.000 s; acknowledge at or after that'
		);
		expect(parseAckTime('61', event, { endTime: 60 })).toBe('the recording ends at 60.000 s');
		expect(parseAckTime('soon', event, { endTime: 60 })).toBe('"soon" is not a number of seconds');
	});
});
