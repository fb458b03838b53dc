import { describe, expect, it } from 'vitest';
import shippedSchema from '../../../schema/framewright-map.schema.json';
import { formatCanId, formatJsonPath, mapJsonSchema, parseMap, serializeMap } from './map-json';

// Demo data: an invented dash-display scenario, not a check value.
const demoText = `{
  "format": "framewright-map@1",
  "name": "Demo dash feed",
  "frames": [
    { "name": "EngineFast", "id": "0x360", "cycleMs": 20, "sender": "ecu",
      "signals": [
        { "name": "engineSpeed", "startBit": 0, "length": 16, "unit": "rpm" },
        { "name": "manifoldPressure", "startBit": 24, "length": 16, "byteOrder": "big", "scale": 0.1, "unit": "kPa", "min": 0, "max": 600 }
      ] },
    { "name": "Pages", "id": 419430400, "extended": true, "length": 64,
      "signals": [
        { "name": "page", "startBit": 0, "length": 8, "multiplexer": true, "labels": { "0": "temps", "1": "pressures" } },
        { "name": "oilTemp", "startBit": 8, "length": 8, "offset": -40, "muxValue": 0, "unit": "°C" }
      ] }
  ]
}`;

describe('parseMap', () => {
	it('accepts a good file, fills defaults and reads hex IDs', () => {
		const result = parseMap(demoText);
		expect(result.ok).toBe(true);
		if (!result.ok) return;
		expect(result.map.bitrate).toBe(500000);
		expect(result.map.frames[0]).toMatchObject({
			id: 0x360,
			extended: false,
			length: 8,
			j1939: false
		});
		expect(result.map.frames[0].signals[0]).toMatchObject({
			byteOrder: 'little',
			valueType: 'unsigned',
			scale: 1,
			offset: 0,
			labels: {}
		});
		expect(result.map.frames[1]).toMatchObject({ id: 0x19000000, extended: true, length: 64 });
	});

	it('accepts an already-parsed object too', () => {
		expect(parseMap(JSON.parse(demoText)).ok).toBe(true);
	});

	it('reports malformed JSON with line and column', () => {
		const broken = demoText.replace('"sender": "ecu",', '"sender": "ecu",,');
		const result = parseMap(broken);
		expect(result).toEqual({
			ok: false,
			problems: [
				{
					path: '',
					line: 5,
					column: 75,
					message: expect.stringMatching(
						/^JSON syntax error at line 5, column 75: expected a property name/
					)
				}
			]
		});
		// the reported column points at the second comma
		expect(broken.split('\n')[4][74]).toBe(',');
	});

	it('reports every problem of a bad file with its JSON path', () => {
		const bad = {
			format: 'framewright-map@1',
			name: '',
			frames: [
				{ name: 'A', id: 'zz', length: 9, signals: [{ name: 'x', startBit: 0, length: 0 }] },
				{
					name: 'B',
					id: '0x2FFFFFFF',
					colour: 'red',
					signals: [{ startBit: 'eight', length: 8, byteOrder: 'middle' }]
				}
			]
		};
		const result = parseMap(bad);
		expect(result.ok).toBe(false);
		if (result.ok) return;
		expect(result.problems).toEqual(
			expect.arrayContaining([
				{ path: 'name', message: 'a map needs a name' },
				{
					path: 'frames[0].id',
					message: 'must be a hex string like "0x360" or a whole number from 0 to 0x1FFFFFFF'
				},
				{
					path: 'frames[0].length',
					message: 'payload length must be 0–8, 12, 16, 20, 24, 32, 48 or 64 bytes'
				},
				{ path: 'frames[0].signals[0].length', message: 'must be 1–64 bits' },
				{ path: 'frames[1].id', message: 'above 0x1FFFFFFF' },
				{ path: 'frames[1]', message: 'unknown field "colour"' },
				{ path: 'frames[1].signals[0].name', message: 'is required (string)' },
				{
					path: 'frames[1].signals[0].startBit',
					message: 'expected a number, got the text "eight"'
				},
				{
					path: 'frames[1].signals[0].byteOrder',
					message: 'Invalid option: expected one of "little"|"big"'
				}
			])
		);
		expect(result.problems).toHaveLength(9);
	});

	it('explains a wrong format tag', () => {
		const result = parseMap({ format: 'something-else', name: 'x' });
		expect(result).toEqual({
			ok: false,
			problems: [
				{ path: 'format', message: expect.stringContaining('must be "framewright-map@1"') }
			]
		});
	});

	it('rejects a document that is not an object', () => {
		expect(parseMap('[1, 2]')).toEqual({
			ok: false,
			problems: [{ path: '', message: 'expected an object, got an array' }]
		});
	});
});

describe('serializeMap', () => {
	it('round-trips: parse(serialize(map)) equals map, and serialize is stable', () => {
		const first = parseMap(demoText);
		if (!first.ok) throw new Error('demo map must parse');
		const text = serializeMap(first.map);
		const again = parseMap(text);
		expect(again).toEqual({ ok: true, map: first.map });
		if (again.ok) expect(serializeMap(again.map)).toBe(text);
	});

	it('writes IDs as hex strings', () => {
		const parsed = parseMap(demoText);
		if (!parsed.ok) throw new Error('demo map must parse');
		const document = JSON.parse(serializeMap(parsed.map));
		expect(document.frames.map((f: { id: string }) => f.id)).toEqual(['0x360', '0x19000000']);
	});

	it.each([
		[0x7ff, false, '0x7FF'],
		[0x5, false, '0x005'],
		[0x18fef100, true, '0x18FEF100'],
		[0x100, true, '0x00000100']
	])('formatCanId(%i, %s) → %s', (id, extended, text) => {
		expect(formatCanId(id, extended)).toBe(text);
	});
});

describe('formatJsonPath', () => {
	it('writes indexes in brackets and odd keys quoted', () => {
		expect(formatJsonPath(['frames', 2, 'signals', 0, 'length'])).toBe(
			'frames[2].signals[0].length'
		);
		expect(formatJsonPath(['frames', 0, 'signals', 1, 'labels', '3'])).toBe(
			'frames[0].signals[1].labels["3"]'
		);
		expect(formatJsonPath([])).toBe('');
	});
});

describe('JSON Schema', () => {
	it('the shipped schema/framewright-map.schema.json equals a fresh generation (run `npm run schema`)', () => {
		expect(shippedSchema).toEqual(JSON.parse(JSON.stringify(mapJsonSchema())));
	});

	it('describes the input side: hex or numeric IDs, defaulted fields optional, unknown fields refused', () => {
		// eslint-disable-next-line @typescript-eslint/no-explicit-any -- walking generated JSON Schema
		const schema = mapJsonSchema() as any;
		expect(schema.required).toEqual(['format', 'name']);
		expect(schema.additionalProperties).toBe(false);
		const frame = schema.properties.frames.items;
		expect(frame.required).toEqual(['name', 'id']);
		expect(frame.properties.id.anyOf.map((s: { type: string }) => s.type)).toEqual([
			'integer',
			'string'
		]);
		expect(frame.properties.length.enum).toEqual([
			0, 1, 2, 3, 4, 5, 6, 7, 8, 12, 16, 20, 24, 32, 48, 64
		]);
	});

	it('makes alert rules optional, and a rule a choice of condition with its own setpoint fields', () => {
		// eslint-disable-next-line @typescript-eslint/no-explicit-any -- walking generated JSON Schema
		const schema = mapJsonSchema() as any;
		expect(schema.properties.alertRules.type).toBe('array');
		const variants =
			schema.properties.alertRules.items.oneOf ?? schema.properties.alertRules.items.anyOf;
		expect(
			variants.map(
				(v: { properties: { condition: { const: string } } }) => v.properties.condition.const
			)
		).toEqual(['above', 'below', 'outside']);
		expect(variants[2].required).toEqual(
			expect.arrayContaining(['channel', 'severity', 'low', 'high'])
		);
	});
});

describe('alert rules in a map file', () => {
	it('a file without alertRules still parses, with none', () => {
		const parsed = parseMap(demoText);
		expect(parsed.ok && parsed.map.alertRules).toEqual([]);
	});

	it('reports a bad rule by its JSON path and survives a serialize round trip when good', () => {
		const rule = {
			id: 'hot',
			name: 'Hot',
			channel: { frame: 'EngineFast', signal: 'engineSpeed' },
			severity: 'critical',
			condition: 'above',
			setpoint: 7000,
			latching: true
		};
		const good = parseMap({ ...JSON.parse(demoText), alertRules: [rule] });
		expect(good.ok).toBe(true);
		if (good.ok) expect(parseMap(serializeMap(good.map))).toEqual(good);
		const bad = parseMap({
			...JSON.parse(demoText),
			alertRules: [rule, { ...rule, id: 'x', severity: 'urgent', onDelayS: -1 }]
		});
		expect(bad.ok ? [] : bad.problems.map((p) => p.path)).toEqual([
			'alertRules[1].severity',
			'alertRules[1].onDelayS'
		]);
	});
});
