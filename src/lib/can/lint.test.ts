import { describe, expect, it } from 'vitest';
import { lintMap, type LintCode } from './lint';
import clubRacerJson from '../../../fixtures/club-racer-ecu.map.json';
import { canMapSchema, type FrameInput, type SignalInput } from './map';
import { parseMap } from './map-json';

const mapOf = (frames: FrameInput[]) =>
	canMapSchema.parse({ format: 'framewright-map@1', name: 'lint test', frames });
const sig = (
	name: string,
	startBit: number,
	length: number,
	extra: Partial<SignalInput> = {}
): SignalInput => ({ name, startBit, length, ...extra });
const frame = (signals: SignalInput[], extra: Partial<FrameInput> = {}): FrameInput => ({
	name: 'F',
	id: '0x100',
	signals,
	...extra
});

describe('lintMap', () => {
	it('finds nothing in a clean map with multiplexing, both byte orders and J1939', () => {
		const map = mapOf([
			frame(
				[
					sig('page', 0, 4, { multiplexer: true }),
					sig('a', 8, 16, { muxValue: 0 }),
					sig('b', 8, 16, { muxValue: 1, valueType: 'signed' }), // same bits, other page: fine
					sig('c', 40, 16, {
						byteOrder: 'big',
						min: 0,
						max: 10,
						labels: { '0': 'off', '65535': 'n/a' }
					}), // bytes 4–5
					sig('d', 48, 32, { valueType: 'float32' }) // bytes 6–9 of a 12-byte FD frame
				],
				{ length: 12 }
			),
			frame([sig('speed', 24, 16, { scale: 0.125 })], {
				name: 'J',
				id: '0x0CF00400',
				extended: true,
				j1939: true
			}),
			frame([], { name: 'Std', id: '0x7FF' })
		]);
		expect(lintMap(map)).toEqual([]);
	});

	// One minimal map per problem; the expected path names the field to fix.
	it.each<[LintCode, FrameInput[], string, number | null]>([
		[
			'signal-overlap',
			[frame([sig('a', 0, 12), sig('b', 8, 8)])],
			'frames[0].signals[1].startBit',
			1
		],
		[
			'signal-overlap',
			[frame([sig('m', 0, 8, { multiplexer: true }), sig('a', 4, 8, { muxValue: 1 })])],
			'frames[0].signals[1].startBit',
			1
		],
		[
			'signal-overlap',
			[
				frame([
					sig('m', 0, 8, { multiplexer: true }),
					sig('a', 8, 8, { muxValue: 1 }),
					sig('always', 12, 8)
				])
			],
			'frames[0].signals[2].startBit',
			2
		],
		['beyond-payload', [frame([sig('a', 60, 8)])], 'frames[0].signals[0].startBit', 0],
		[
			'beyond-payload',
			[frame([sig('a', 8, 24, { byteOrder: 'big' })])],
			'frames[0].signals[0].startBit',
			0
		],
		[
			'beyond-payload',
			[frame([sig('a', 8, 8)], { length: 1 })],
			'frames[0].signals[0].startBit',
			0
		],
		['duplicate-frame-id', [frame([]), frame([], { name: 'G', id: 256 })], 'frames[1].id', null],
		[
			'duplicate-pgn',
			[
				frame([], { id: '0x18FEF100', extended: true, j1939: true }),
				frame([], { name: 'G', id: '0x0CFEF117', extended: true, j1939: true })
			],
			'frames[1].id',
			null
		],
		['duplicate-frame-name', [frame([]), frame([], { id: '0x101' })], 'frames[1].name', null],
		[
			'duplicate-signal-name',
			[frame([sig('a', 0, 8), sig('a', 8, 8)])],
			'frames[0].signals[1].name',
			1
		],
		['standard-id-range', [frame([], { id: '0x800' })], 'frames[0].id', null],
		['zero-scale', [frame([sig('a', 0, 8, { scale: 0 })])], 'frames[0].signals[0].scale', 0],
		[
			'min-above-max',
			[frame([sig('a', 0, 8, { min: 10, max: 5 })])],
			'frames[0].signals[0].min',
			0
		],
		[
			'float-length',
			[frame([sig('a', 0, 16, { valueType: 'float32' })])],
			'frames[0].signals[0].length',
			0
		],
		[
			'float-length',
			[frame([sig('a', 0, 32, { valueType: 'float64' })])],
			'frames[0].signals[0].length',
			0
		],
		['j1939-standard-id', [frame([], { j1939: true })], 'frames[0].j1939', null],
		[
			'mux-without-multiplexer',
			[frame([sig('a', 0, 8, { muxValue: 2 })])],
			'frames[0].signals[0].muxValue',
			0
		],
		[
			'multiple-multiplexers',
			[frame([sig('m1', 0, 4, { multiplexer: true }), sig('m2', 4, 4, { multiplexer: true })])],
			'frames[0].signals[1].multiplexer',
			1
		],
		[
			'nested-multiplexer',
			[frame([sig('m', 0, 4, { multiplexer: true, muxValue: 1 })])],
			'frames[0].signals[0].muxValue',
			0
		],
		[
			'mux-value-out-of-range',
			[frame([sig('m', 0, 2, { multiplexer: true }), sig('a', 8, 8, { muxValue: 4 })])],
			'frames[0].signals[1].muxValue',
			1
		],
		[
			'label-out-of-range',
			[frame([sig('a', 0, 4, { labels: { '16': 'too big' } })])],
			'frames[0].signals[0].labels',
			0
		],
		[
			'label-out-of-range',
			[frame([sig('a', 0, 4, { valueType: 'signed', labels: { '-9': 'too small' } })])],
			'frames[0].signals[0].labels',
			0
		],
		[
			'limit-unreachable',
			[frame([sig('a', 0, 8, { scale: 0.5, min: 200 })])],
			'frames[0].signals[0].min',
			0
		],
		[
			'limit-unreachable',
			[frame([sig('a', 0, 8, { offset: -40, max: -50 })])],
			'frames[0].signals[0].max',
			0
		],
		[
			'checksum-length',
			[frame([sig('crc', 0, 16, { role: 'checksum' })])],
			'frames[0].signals[0].length',
			0
		],
		[
			'role-scaled',
			[frame([sig('count', 0, 4, { role: 'counter', scale: 0.5 })])],
			'frames[0].signals[0].scale',
			0
		]
	])('%s at %j', (code, frames, path, signalIndex) => {
		const problems = lintMap(mapOf(frames));
		expect(problems.map((p) => p.code)).toEqual([code]);
		expect(problems[0]).toMatchObject({
			path,
			signalIndex,
			frameIndex: path.startsWith('frames[1]') ? 1 : 0
		});
		expect(problems[0].message.length).toBeGreaterThan(10);
	});

	it('names the shared bits of an overlap', () => {
		const [problem] = lintMap(mapOf([frame([sig('a', 0, 12), sig('b', 8, 8)])]));
		expect(problem.message).toBe('"b" overlaps "a" on payload bits 8–11');
		expect(problem.severity).toBe('error');
	});

	it('follows the big-endian bit walk when checking overlap (docs/bit-numbering.md)', () => {
		// big-endian 16 bits at startBit 8 fills bytes 0–1 (bits 8–15 then 0–7); a little-endian byte 0 overlaps it.
		const [problem] = lintMap(
			mapOf([frame([sig('be', 8, 16, { byteOrder: 'big' }), sig('b0', 0, 8)])])
		);
		expect(problem.message).toBe('"b0" overlaps "be" on payload bits 0–7');
	});

	it('grades warnings and errors', () => {
		const problems = lintMap(mapOf([frame([sig('a', 0, 4, { labels: { '99': 'x' }, scale: 0 })])]));
		expect(problems.map((p) => [p.code, p.severity])).toEqual([
			['zero-scale', 'error'],
			['label-out-of-range', 'warning']
		]);
	});

	describe('alert rules', () => {
		const withRules = (alertRules: unknown[]) =>
			canMapSchema.parse({
				format: 'framewright-map@1',
				name: 'lint test',
				frames: [frame([sig('temp', 0, 8, { offset: -40, unit: '°C' })])],
				alertRules
			});
		const common = {
			id: 'r',
			name: 'Hot',
			channel: { frame: 'F', signal: 'temp' },
			severity: 'advisory'
		};
		const rule = (extra: Record<string, unknown>) => ({
			...common,
			condition: 'above',
			setpoint: 100,
			...extra
		});

		it('finds nothing wrong with a rule on an existing channel within range', () => {
			expect(lintMap(withRules([rule({})]))).toEqual([]);
		});

		it.each([
			[
				'alert-unknown-frame',
				rule({ channel: { frame: 'Nope', signal: 'temp' } }),
				'alertRules[0].channel.frame',
				'error'
			],
			[
				'alert-unknown-signal',
				rule({ channel: { frame: 'F', signal: 'nope' } }),
				'alertRules[0].channel.signal',
				'error'
			],
			// An 8-bit unsigned field with offset −40 carries −40…215 (raw 0…255).
			['alert-setpoint-out-of-range', rule({ setpoint: 300 }), 'alertRules[0].setpoint', 'warning'],
			[
				'alert-band-inverted',
				{ ...common, condition: 'outside', low: 90, high: 10 },
				'alertRules[0].low',
				'error'
			]
		])('reports %s at %s, prefixed and with a map-relative path', (code, bad, path, severity) => {
			const problems = lintMap(withRules([bad]));
			expect(problems.map((p) => [p.code, p.path, p.severity])).toEqual([[code, path, severity]]);
			expect(problems[0]).toMatchObject({ frameIndex: null, signalIndex: null });
		});

		it('points at the right rule in a list', () => {
			const problems = lintMap(withRules([rule({}), rule({ id: 'r2', name: 'hot' })]));
			expect(problems.map((p) => [p.code, p.path])).toEqual([
				['alert-duplicate-rule-name', 'alertRules[1].name']
			]);
		});

		it('the demo fixture map, rules included, lints clean', () => {
			const parsed = parseMap(clubRacerJson);
			expect(parsed.ok && parsed.map.alertRules.length).toBe(2);
			expect(parsed.ok && lintMap(parsed.map)).toEqual([]);
		});
	});
});
