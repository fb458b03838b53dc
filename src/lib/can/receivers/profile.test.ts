import { describe, expect, it } from 'vitest';
import shippedProfileSchema from '../../../../schema/framewright-profile.schema.json';
import shippedReceiveSchema from '../../../../schema/framewright-receive.schema.json';
import { parseProfile, profileJsonSchema } from './profile';
import { receiveSetJsonSchema } from './receive-set';

// Demo data: an invented logger, not a check value.
const good = {
	format: 'framewright-profile@1',
	name: 'Pit logger',
	kind: 'logger',
	wanted: [
		{ name: 'Oil pressure', quantity: 'pressure', unit: 'psi', min: 0, max: 150 },
		{ name: 'AFR', quantity: 'air-fuel-ratio', unit: 'AFR', fuel: 'e85', decimals: 2 }
	],
	alertRules: [
		{
			id: 'low',
			name: 'Low oil',
			channel: 'Oil pressure',
			severity: 'critical',
			condition: 'below',
			setpoint: 15
		}
	]
};

describe('parseProfile', () => {
	it('accepts a good profile and fills defaults', () => {
		const result = parseProfile(JSON.stringify(good));
		expect(result.ok).toBe(true);
		if (!result.ok) return;
		expect(result.value.wanted[0]).toEqual({
			name: 'Oil pressure',
			quantity: 'pressure',
			unit: 'psi',
			min: 0,
			max: 150,
			decimals: 0,
			required: false,
			fuel: null,
			notes: ''
		});
		expect(result.value.manualLinks).toEqual([]);
		expect(result.value.alertRules[0]).toMatchObject({ channel: 'Oil pressure', latching: false });
	});

	it('refuses a quantity the unit does not measure, naming the units it could use', () => {
		const result = parseProfile({
			...good,
			wanted: [{ name: 'Coolant', quantity: 'temperature', unit: 'kPa' }],
			alertRules: []
		});
		expect(result).toEqual({
			ok: false,
			problems: [
				{
					path: 'wanted[0].unit',
					message:
						'unit "kPa" does not measure temperature (it measures pressure); use one of °C, °F, K'
				}
			]
		});
	});

	it('reports every field problem by JSON path: unknown kind and quantity, empty range', () => {
		const result = parseProfile({
			...good,
			kind: 'gauge',
			wanted: [
				{ name: 'Boost', quantity: 'boost', unit: 'psi' },
				{ name: 'Oil', quantity: 'pressure', unit: 'bar', min: 10, max: 5 }
			],
			alertRules: []
		});
		expect(result.ok ? [] : result.problems).toEqual([
			{ path: 'kind', message: 'kind must be one of display, logger, power-module, other' },
			{
				path: 'wanted[0].quantity',
				message: expect.stringMatching(/^quantity must be one of temperature, pressure, /)
			},
			{ path: 'wanted[1].max', message: 'display range 10…5 is empty; max must be above min' }
		]);
	});

	it('then the cross-checks: duplicate names, links and rules naming channels the profile lacks', () => {
		// zod runs whole-profile checks once every field is valid, like lint after parsing a map.
		const result = parseProfile({
			...good,
			wanted: [...good.wanted, { name: 'oil pressure', quantity: 'pressure', unit: 'bar' }],
			manualLinks: [{ wanted: 'Fuel', frame: 'F', signal: 'S' }],
			alertRules: [{ ...good.alertRules[0], channel: 'Oil temp' }]
		});
		expect(result.ok ? [] : result.problems).toEqual([
			{
				path: 'wanted[2].name',
				message:
					'wanted channel "oil pressure" is already wanted[0] (names are compared ignoring case)'
			},
			{ path: 'manualLinks[0].wanted', message: '"Fuel" is not a wanted channel of this profile' },
			{
				path: 'alertRules[0].channel',
				message: 'rule "Low oil" watches "Oil temp", which is not a wanted channel of this profile'
			}
		]);
	});

	it('explains a file that is not a profile', () => {
		const result = parseProfile({ format: 'framewright-map@1', name: 'x', kind: 'display' });
		expect(result.ok ? [] : result.problems).toEqual([
			{
				path: 'format',
				message: expect.stringContaining('must be "framewright-profile@1"')
			}
		]);
	});

	it('reports malformed JSON with its line', () => {
		const result = parseProfile('{\n  "format": "framewright-profile@1",\n  "name": }');
		expect(result.ok ? null : result.problems[0]).toMatchObject({ path: '', line: 3 });
	});
});

describe('JSON Schemas', () => {
	it('the shipped schema/framewright-profile.schema.json equals a fresh generation (run `npm run schema`)', () => {
		expect(shippedProfileSchema).toEqual(JSON.parse(JSON.stringify(profileJsonSchema())));
	});

	it('the shipped schema/framewright-receive.schema.json equals a fresh generation (run `npm run schema`)', () => {
		expect(shippedReceiveSchema).toEqual(JSON.parse(JSON.stringify(receiveSetJsonSchema())));
	});

	it('the profile schema lists the quantities and makes defaulted fields optional', () => {
		// eslint-disable-next-line @typescript-eslint/no-explicit-any -- walking generated JSON Schema
		const schema = profileJsonSchema() as any;
		expect(schema.required).toEqual(['format', 'name', 'kind']);
		const wanted = schema.properties.wanted.items;
		expect(wanted.required).toEqual(['name', 'quantity']);
		expect(wanted.properties.quantity.enum).toContain('air-fuel-ratio');
		expect(wanted.additionalProperties).toBe(false);
	});
});
