import { describe, expect, it } from 'vitest';
import { eventKey, replayStatus } from './alert-replay';
import { setpointFields, setpointText } from './alert-rule-table';

describe('replayed alert events: keys and the count line', () => {
	it('keys an event by its rule and start, so it survives a replay with other acknowledgements', () => {
		expect(eventKey({ rule: 'over-speed', start: 12.5 })).toBe('over-speed@12.5');
	});

	it('counts events, rules and acknowledgements in words, singular and plural', () => {
		expect(replayStatus({ events: 1, rules: 1, acknowledgements: 0 }, 'event')).toBe(
			'1 event from 1 rule.'
		);
		expect(replayStatus({ events: 0, rules: 3, acknowledgements: 0 }, 'alert event')).toBe(
			'0 alert events from 3 rules.'
		);
		expect(replayStatus({ events: 4, rules: 2, acknowledgements: 1 }, 'event')).toBe(
			'4 events from 2 rules, with 1 acknowledgement replayed.'
		);
		expect(replayStatus({ events: 4, rules: 2, acknowledgements: 2 }, 'event')).toMatch(
			/with 2 acknowledgements replayed\.$/
		);
	});
});

describe('alert rule table helpers', () => {
	it('a band condition edits low and high, the others one setpoint', () => {
		expect(setpointFields('outside')).toEqual(['low', 'high']);
		expect(setpointFields('above')).toEqual(['setpoint']);
		expect(setpointFields('below')).toEqual(['setpoint']);
	});

	it('shows the setpoint or the band with the unit', () => {
		expect(setpointText({ condition: 'above', setpoint: 110 }, '°C')).toBe('110 °C');
		expect(setpointText({ condition: 'outside', low: 1.5, high: 6 }, 'bar')).toBe('1.5 … 6 bar');
	});
});
