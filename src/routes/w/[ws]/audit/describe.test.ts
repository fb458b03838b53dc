import { describe, expect, it } from 'vitest';
import type { AuditRecord } from '$lib/server/workspaces/audit-log';
import { AUDIT_KINDS, describeEntry, entryTime } from './describe.server';

const alex = { email: 'alex@example.test', name: 'Alex' };
const entry = (facts: Partial<AuditRecord>): AuditRecord => ({
	id: 1,
	action: 'map.publish',
	createdAt: '2026-12-02T14:02:41.512Z',
	actor: alex,
	target: null,
	details: {},
	mapName: null,
	subject: null,
	captureName: null,
	...facts
});

describe('describeEntry', () => {
	it('names who did what to which thing', () => {
		expect(
			describeEntry(entry({ details: { revision: 3, note: 'x' }, mapName: 'Club racer ECU' }))
		).toBe('Alex published r3 of Club racer ECU');
		expect(
			describeEntry(
				entry({
					action: 'member.role_change',
					actor: { email: 'owner@example.test', name: null },
					subject: { email: 'sam@example.test', name: 'Sam' },
					details: { from: 'editor', to: 'viewer' }
				})
			)
		).toBe('owner@example.test made Sam Viewer (was Editor)');
		expect(
			describeEntry(
				entry({ action: 'map.bitrate', mapName: 'Gearbox', details: { from: 500000, to: 250000 } })
			)
		).toBe('Alex set the bit rate of Gearbox to 250 kbit/s (was 500 kbit/s)');
		expect(
			describeEntry(
				entry({
					action: 'capture.decode',
					captureName: 'track day 3.csv',
					mapName: 'Club racer ECU',
					details: { revision: 'draft' }
				})
			)
		).toBe('Alex decoded the capture track day 3.csv with the draft of Club racer ECU');
		expect(
			describeEntry(
				entry({
					action: 'capture.bitrate',
					captureName: 'two buses.csv',
					details: { from: null, to: 125000, dataFrom: null, dataTo: 2000000 }
				})
			)
		).toBe(
			'Alex set the bit rate of the capture two buses.csv to 125 kbit/s, data phase 2000 kbit/s (was a guess)'
		);
	});

	it('falls back to what the entry recorded once the thing or person is gone', () => {
		expect(
			describeEntry(entry({ action: 'map.delete', actor: null, details: { name: 'Old map' } }))
		).toBe('A former member deleted the map Old map');
		expect(describeEntry(entry({ action: 'member.remove', details: { role: 'editor' } }))).toBe(
			'Alex removed a former member (Editor)'
		);
		// A kind added later still reads as who, what and which target.
		expect(describeEntry(entry({ action: 'alert_rule.mute', target: 'r-7' }))).toBe(
			'Alex: alert_rule.mute (r-7)'
		);
	});

	it('has words for every kind the filter offers', () => {
		const kinds = AUDIT_KINDS.flatMap((g) => Object.keys(g.verbs));
		for (const action of kinds) {
			expect(describeEntry(entry({ action }))).not.toContain(`: ${action}`);
			expect(action.startsWith(AUDIT_KINDS.find((g) => action in g.verbs)!.subject + '.')).toBe(
				true
			);
		}
	});
});

describe('entryTime', () => {
	it('writes day, short month, year and 24-hour time in UTC', () => {
		expect(entryTime('2026-12-02T14:02:41.512Z')).toBe('2 Dec 2026 14:02');
		// Just before midnight UTC stays on that day whatever the machine's own zone.
		expect(entryTime('2027-01-09T23:59:00.000Z')).toBe('9 Jan 2027 23:59');
		expect(entryTime('2027-03-01T00:05:00.000Z')).toBe('1 Mar 2027 00:05');
	});
});
