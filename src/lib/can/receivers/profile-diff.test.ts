import { describe, expect, it } from 'vitest';
import type { Link } from './link-schema';
import { diffProfiles, type ProfileSnapshot } from './profile-diff';
import { receiverProfileSchema } from './profile';

// Demo data: an invented pit display, not a check value. The expected differences are worked out
// by hand from the two snapshots below.
const profile = receiverProfileSchema.parse({
	format: 'framewright-profile@1',
	name: 'Pit display',
	kind: 'display',
	wanted: [
		{ name: 'Oil pressure', quantity: 'pressure', unit: 'bar', min: 0, max: 10 },
		{ name: 'ECT', quantity: 'temperature', unit: '°C' }
	],
	alertRules: [
		{
			id: 'low',
			name: 'Low oil',
			channel: 'Oil pressure',
			severity: 'critical',
			condition: 'below',
			setpoint: 1.5
		}
	]
});

const link = (wanted: string, signal: string, scale = 1): Link => ({
	wanted,
	frame: 'Pressures',
	id: 0x5f2,
	extended: false,
	signal,
	conversion: {
		kind: scale === 1 ? 'identity' : 'units',
		from: 'kPa',
		to: 'bar',
		form: 'linear',
		scale,
		offset: 0,
		fuel: null
	},
	confidence: 0.98,
	manual: false
});

const before: ProfileSnapshot = {
	profile,
	links: [link('Oil pressure', 'OilPressure', 0.01)],
	linkedTo: 'Club racer r1'
};

describe('diffProfiles', () => {
	it('finds nothing between a snapshot and itself', () => {
		expect(diffProfiles(before, structuredClone(before))).toMatchObject({ identical: true });
	});

	it('names changed fields, channels matched ignoring case, links by channel and rules by id', () => {
		const after: ProfileSnapshot = {
			profile: {
				...profile,
				wanted: [
					{ ...profile.wanted[0], name: 'OIL PRESSURE', max: 12 },
					{ ...profile.wanted[1], name: 'Coolant', unit: '°F' }
				],
				alertRules: [{ ...profile.alertRules[0], name: 'Oil pressure low' }]
			},
			links: [{ ...link('Oil pressure', 'OilPressure2', 0.01), confidence: 0.5 }],
			linkedTo: 'Club racer r2'
		};
		const diff = diffProfiles(before, after);
		expect(diff.identical).toBe(false);
		expect(diff.changes).toEqual([
			{ field: 'linkedTo', from: 'Club racer r1', to: 'Club racer r2' }
		]);
		expect(diff.wanted).toEqual([
			{
				key: 'oil pressure',
				name: 'OIL PRESSURE',
				status: 'changed',
				changes: [{ field: 'max', from: 10, to: 12 }]
			},
			// A removed channel stays where it stood, before the one added after it.
			{ key: 'ect', name: 'ECT', status: 'removed', changes: [] },
			{ key: 'coolant', name: 'Coolant', status: 'added', changes: [] }
		]);
		// The confidence changed too, but only what the device receives counts.
		expect(diff.links).toEqual([
			{
				key: 'oil pressure',
				name: 'Oil pressure',
				status: 'changed',
				changes: [{ field: 'signal', from: 'OilPressure', to: 'OilPressure2' }]
			}
		]);
		expect(diff.alertRules).toEqual([
			{
				id: 'low',
				name: 'Oil pressure low',
				status: 'changed',
				changes: [{ field: 'name', from: 'Low oil', to: 'Oil pressure low' }]
			}
		]);
	});
});
