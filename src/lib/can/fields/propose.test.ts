/**
 * Planted-field checks: frames are generated with known fields (testing/planted-capture.ts writes
 * every bit with the slow reference bit walk and every checksum with the bit-by-bit CRC), and the
 * proposals must name each planted field with its exact bits, byte order and kind.
 */
import { describe, expect, it } from 'vitest';
import type { ByteOrder } from '../map';
import {
	plantedFrames,
	type ChecksumAlgorithm,
	type PlantedField,
	type PlantedSpec
} from '../testing/planted-capture';
import { referencePositions } from '../testing/reference-bits';
import { seededRandom } from '../testing/seeded-random';
import { idFramesFromPayloads } from './frames';
import { idProposalsSchema, type FieldProposal, type IdProposals } from './proposal';
import { proposeFields } from './propose';

function propose(spec: PlantedSpec): IdProposals {
	const { time, payloads } = plantedFrames(spec);
	const result = proposeFields(idFramesFromPayloads(0x123, false, time, payloads));
	// The output always satisfies its own schema (what the worker and the CLI hand on).
	expect(idProposalsSchema.parse(result)).toEqual(result);
	return result;
}

/** Payload bits of a field, least significant first, by the reference walk. */
const bitsOf = (f: { startBit: number; length: number; byteOrder: ByteOrder }) =>
	referencePositions(f.startBit, f.length, f.byteOrder);

function describe_(fields: FieldProposal[]) {
	return fields
		.map((f) => `${f.kind} ${f.startBit}/${f.length}/${f.byteOrder} page ${f.muxValue}`)
		.join('\n');
}

/** The proposal of this kind covering exactly these bits (in this order), on this page. */
function expectProposal(
	result: IdProposals,
	kind: FieldProposal['kind'],
	field: { startBit: number; length: number; byteOrder: ByteOrder },
	muxValue: number | null = null
): FieldProposal {
	const wanted = bitsOf(field);
	const match = result.fields.find(
		(f) =>
			f.kind === kind &&
			f.muxValue === muxValue &&
			JSON.stringify(bitsOf(f)) === JSON.stringify(wanted)
	);
	expect(
		match,
		`${kind} at bits ${wanted.join(',')} (page ${muxValue}) among\n${describe_(result.fields)}`
	).toBeDefined();
	expect(match!.confidence).toBeGreaterThan(0);
	expect(match!.confidence).toBeLessThanOrEqual(1);
	return match!;
}

/** No proposal may cover a bit that only carries noise. */
function expectNothingOn(result: IdProposals, noise: { startBit: number; length: number }[]) {
	const noiseBits = new Set(
		noise.flatMap((n) => referencePositions(n.startBit, n.length, 'little'))
	);
	for (const f of result.fields) {
		const hit = bitsOf(f).filter((b) => noiseBits.has(b));
		expect(hit, `${f.kind} ${f.startBit}/${f.length}/${f.byteOrder} covers noise`).toEqual([]);
	}
}

const noise = (startBit: number, length: number): PlantedField => ({
	kind: 'noise',
	startBit,
	length
});

describe('counters and constants', () => {
	const fields: PlantedField[] = [
		{ kind: 'counter', startBit: 0, length: 4, byteOrder: 'little', step: 1 },
		noise(4, 2),
		{ kind: 'counter', startBit: 6, length: 2, byteOrder: 'little', step: 1 },
		{ kind: 'counter', startBit: 8, length: 8, byteOrder: 'little', step: 3 },
		{ kind: 'counter', startBit: 16, length: 3, byteOrder: 'little', step: 5 },
		noise(19, 5),
		// Step 255 = counting down by one.
		{ kind: 'counter', startBit: 24, length: 8, byteOrder: 'little', step: 255 },
		// Big-endian across bytes 5 (low) and 4 (bits 32–35).
		{ kind: 'counter', startBit: 40, length: 12, byteOrder: 'big', step: 7 },
		noise(36, 4),
		{ kind: 'constant', startBit: 48, length: 8, value: 0xa5 },
		noise(56, 2),
		{ kind: 'constant', startBit: 58, length: 3, value: 5 },
		noise(61, 3)
	];

	it.each([1, 2, 3])('finds each counter with its step, and the constants (seed %i)', (seed) => {
		const result = propose({ seed, frames: 3000, payloadLength: 8, period: 0.01, fields });
		for (const f of fields) {
			if (f.kind === 'counter') {
				const p = expectProposal(result, 'counter', f);
				expect(p).toMatchObject({ step: f.step, share: 1 });
			}
			if (f.kind === 'constant') {
				const p = expectProposal(result, 'constant', { ...f, byteOrder: 'little' });
				expect(p).toMatchObject({ value: f.value });
			}
		}
		expectNothingOn(
			result,
			fields.filter((f) => f.kind === 'noise')
		);
	});

	it('reports the share of frame pairs that follow the rule when frames are missing', () => {
		const { time, payloads } = plantedFrames({
			seed: 9,
			frames: 2000,
			payloadLength: 2,
			period: 0.01,
			fields: [
				{ kind: 'counter', startBit: 0, length: 8, byteOrder: 'little', step: 1 },
				noise(8, 8)
			]
		});
		// Drop every 20th frame: 1900 frames, 1899 pairs, 99 of which skip a count.
		const kept = payloads.filter((_, i) => i % 20 !== 19);
		const result = proposeFields(idFramesFromPayloads(1, false, time.slice(0, kept.length), kept));
		const counter = expectProposal(result, 'counter', {
			startBit: 0,
			length: 8,
			byteOrder: 'little'
		});
		expect(counter).toMatchObject({ step: 1, pairs: 1899 });
		expect((counter as { share: number }).share).toBeCloseTo(1800 / 1899, 4);
	});
});

describe('checksums', () => {
	const algorithms: ChecksumAlgorithm[] = ['xor', 'sum', 'crc8-sae-j1850', 'crc8-autosar'];
	const counterBits = [48, 49, 50, 51];
	const cases = algorithms.flatMap((algorithm) =>
		[null, 0x5a].flatMap((dataId) =>
			[false, true].map((cleared) => ({ algorithm, dataId, cleared }))
		)
	);

	it.each(cases)('finds %o', ({ algorithm, dataId, cleared }) => {
		// An XOR relation holds for every byte it covers; it is reported at the last of them, so it is
		// planted there. The other functions sit in byte 0.
		const byte = algorithm === 'xor' ? 7 : 0;
		const fields: PlantedField[] = [
			...(algorithm === 'xor' ? [noise(0, 8)] : [noise(56, 8)]),
			{
				kind: 'value',
				startBit: 8,
				length: 16,
				byteOrder: 'little',
				signed: false,
				speed: 40,
				accel: 4
			},
			noise(24, 8),
			{ kind: 'constant', startBit: 32, length: 8, value: 0x3c },
			noise(40, 8),
			{ kind: 'counter', startBit: 48, length: 4, byteOrder: 'little', step: 1 },
			noise(52, 4),
			{ kind: 'checksum', byte, algorithm, dataId, clearedBits: cleared ? counterBits : [] }
		];
		const result = propose({ seed: 5, frames: 2000, payloadLength: 8, period: 0.01, fields });
		const checksum = expectProposal(result, 'checksum', {
			startBit: byte * 8,
			length: 8,
			byteOrder: 'little'
		});
		expect(checksum).toMatchObject({
			algorithm,
			dataId,
			clearedBits: cleared ? counterBits : [],
			share: 1,
			inputBytes: [0, 1, 2, 3, 4, 5, 6, 7].filter((b) => b !== byte)
		});
		expectProposal(result, 'counter', { startBit: 48, length: 4, byteOrder: 'little' });
	});

	it('explains only the share of frames that carry a right checksum', () => {
		const spec: PlantedSpec = {
			seed: 6,
			frames: 1000,
			payloadLength: 4,
			period: 0.01,
			fields: [
				noise(8, 24),
				{ kind: 'checksum', byte: 0, algorithm: 'crc8-sae-j1850', dataId: null, clearedBits: [] }
			]
		};
		const { time, payloads } = plantedFrames(spec);
		// Corrupt the checksum of every 10th frame.
		payloads.forEach((p, i) => {
			if (i % 10 === 0) p[0] ^= 0x01;
		});
		const result = proposeFields(idFramesFromPayloads(1, false, time, payloads));
		const checksum = expectProposal(result, 'checksum', {
			startBit: 0,
			length: 8,
			byteOrder: 'little'
		});
		expect(checksum).toMatchObject({ algorithm: 'crc8-sae-j1850', share: 0.9 });
	});
});

describe('measured values', () => {
	const fields: PlantedField[] = [
		noise(0, 8),
		{
			kind: 'value',
			startBit: 8,
			length: 16,
			byteOrder: 'little',
			signed: false,
			speed: 200,
			accel: 20
		},
		noise(24, 8),
		// Big-endian signed, 12 bits: bits 32–39 (byte 4), then bits 24–27 of byte 3... planted at 40/32.
		{
			kind: 'value',
			startBit: 40,
			length: 12,
			byteOrder: 'big',
			signed: true,
			speed: 30,
			accel: 3
		},
		noise(36, 4),
		noise(48, 16)
	];

	it.each([1, 2, 3, 4])(
		'finds a little- and a big-endian value driven by random walks, with their signedness (seed %i)',
		(seed) => {
			const result = propose({ seed, frames: 5000, payloadLength: 8, period: 0.01, fields });
			for (const f of fields) {
				if (f.kind !== 'value') continue;
				const p = expectProposal(result, 'value', f);
				expect(p).toMatchObject({ signed: f.signed });
			}
			expectNothingOn(
				result,
				fields.filter((f) => f.kind === 'noise')
			);
		}
	);
});

describe('signed values near zero', () => {
	it('reads sign-extension bits as the top of a signed value, not as a multiplexor', () => {
		// A big-endian signed 16-bit value within ±60, crossing zero in about 1 frame in 8: its top 9 or 10 bits all
		// copy the sign, so any of them seems to switch the others.
		const fields: PlantedField[] = [
			{
				kind: 'value',
				startBit: 8,
				length: 16,
				byteOrder: 'big',
				signed: true,
				speed: 25,
				accel: 25,
				range: [-60, 60]
			},
			noise(16, 16)
		];
		const result = propose({ seed: 8, frames: 5000, payloadLength: 4, period: 0.01, fields });
		expect(
			expectProposal(result, 'value', { startBit: 8, length: 16, byteOrder: 'big' })
		).toMatchObject({
			signed: true
		});
		expect(result.fields.filter((f) => f.kind === 'mux')).toEqual([]);
	});
});

describe('multiplexor', () => {
	const fields: PlantedField[] = [
		{
			kind: 'mux',
			startBit: 0,
			length: 2,
			pages: [
				{
					value: 0,
					fields: [
						{
							kind: 'value',
							startBit: 8,
							length: 16,
							byteOrder: 'little',
							signed: false,
							speed: 300,
							accel: 20
						}
					]
				},
				{
					value: 1,
					fields: [
						{
							kind: 'value',
							startBit: 8,
							length: 8,
							byteOrder: 'little',
							signed: false,
							speed: 3,
							accel: 0.3
						},
						{ kind: 'constant', startBit: 16, length: 8, value: 0x11 }
					]
				},
				{
					value: 2,
					fields: [
						{
							kind: 'value',
							startBit: 16,
							length: 16,
							byteOrder: 'big',
							signed: true,
							speed: 40,
							accel: 4
						}
					]
				}
			]
		},
		noise(2, 6),
		// On every page: a big-endian value in bytes 4 (low) and 3, a counter, a sum checksum.
		{
			kind: 'value',
			startBit: 32,
			length: 16,
			byteOrder: 'big',
			signed: false,
			speed: 150,
			accel: 15
		},
		{ kind: 'counter', startBit: 40, length: 8, byteOrder: 'little', step: 3 },
		{ kind: 'checksum', byte: 6, algorithm: 'sum', dataId: null, clearedBits: [] },
		noise(56, 8)
	];

	it.each([2, 3])('finds the selector, its pages and what each page carries (seed %i)', (seed) => {
		const result = propose({ seed, frames: 6000, payloadLength: 8, period: 0.01, fields });
		const mux = expectProposal(result, 'mux', { startBit: 0, length: 2, byteOrder: 'little' });
		expect(mux).toMatchObject({
			pages: [
				{ value: 0, frames: 2000 },
				{ value: 1, frames: 2000 },
				{ value: 2, frames: 2000 }
			],
			counterStep: null
		});
		const page0 = expectProposal(
			result,
			'value',
			{ startBit: 8, length: 16, byteOrder: 'little' },
			0
		);
		expect(page0).toMatchObject({ signed: false });
		expectProposal(result, 'value', { startBit: 8, length: 8, byteOrder: 'little' }, 1);
		const constant = expectProposal(
			result,
			'constant',
			{ startBit: 16, length: 8, byteOrder: 'little' },
			1
		);
		expect(constant).toMatchObject({ value: 0x11 });
		const page2 = expectProposal(
			result,
			'value',
			{ startBit: 16, length: 16, byteOrder: 'big' },
			2
		);
		expect(page2).toMatchObject({ signed: true });
		// Not multiplexed: one proposal each for every frame.
		expectProposal(result, 'value', { startBit: 32, length: 16, byteOrder: 'big' });
		expectProposal(result, 'counter', { startBit: 40, length: 8, byteOrder: 'little' });
		expect(
			expectProposal(result, 'checksum', { startBit: 48, length: 8, byteOrder: 'little' })
		).toMatchObject({ algorithm: 'sum' });
		expectNothingOn(result, [
			{ startBit: 2, length: 6 },
			{ startBit: 56, length: 8 }
		]);
	});

	it('reports a selector that counts through its pages as the multiplexor, with its step', () => {
		// Page bytes in which every bit changes with the page and no run of bits counts with it (such a
		// run would be a counter too).
		const PAGE_BYTES = [0x0b, 0xb8, 0xd4, 0x54];
		const result = propose({
			seed: 4,
			frames: 3000,
			payloadLength: 4,
			period: 0.01,
			fields: [
				{
					kind: 'mux',
					startBit: 0,
					length: 2,
					pages: [0, 1, 2, 3].map((value) => ({
						value,
						fields: [
							{ kind: 'constant' as const, startBit: 8, length: 8, value: PAGE_BYTES[value] }
						]
					}))
				},
				noise(2, 6),
				{
					kind: 'value',
					startBit: 16,
					length: 16,
					byteOrder: 'little',
					signed: false,
					speed: 100,
					accel: 10
				}
			]
		});
		expect(
			expectProposal(result, 'mux', { startBit: 0, length: 2, byteOrder: 'little' })
		).toMatchObject({
			counterStep: 1
		});
		expect(result.fields.filter((f) => f.kind === 'counter')).toEqual([]);
		for (const value of [0, 1, 2, 3]) {
			const c = expectProposal(
				result,
				'constant',
				{ startBit: 8, length: 8, byteOrder: 'little' },
				value
			);
			expect(c).toMatchObject({ value: PAGE_BYTES[value] });
		}
	});
});

describe('pure noise', () => {
	/**
	 * False positives: IDs whose payload bits are independent coin flips (fair, or biased so bits are
	 * 1 in 10–50 % of frames), 20…3000 frames of 1–8 bytes. Measured over 2,000 such IDs (seeds
	 * 1000…2999, about 3 million frames): 6 IDs (0.3 %) got a proposal, each a constant on bits that
	 * are 1 in only 10 % of frames, in IDs of at most 55 frames (where such a bit is 0 in every frame
	 * by chance); no counter, checksum, multiplexor or value at all. The test replays 200 of them and
	 * allows at most 1 % of IDs with a proposal, the rate docs/field-proposals.md states.
	 */
	it('proposes nothing on at least 99 % of noise IDs', () => {
		let withProposals = 0;
		const ids = 200;
		for (let seed = 1000; seed < 1000 + ids; seed++) {
			const rand = seededRandom(seed);
			const frames = rand.int(20, 3000);
			const length = rand.int(1, 8);
			const bias = rand.pick([0.5, 0.5, 0.3, 0.1]);
			const payloads = Array.from({ length: frames }, () => {
				const p = new Uint8Array(length);
				for (let b = 0; b < length * 8; b++) if (rand.next() < bias) p[b >> 3] |= 1 << (b & 7);
				return p;
			});
			const result = proposeFields(
				idFramesFromPayloads(
					1,
					false,
					Float64Array.from(payloads, (_, i) => i * 0.01),
					payloads
				)
			);
			if (result.fields.length > 0) withProposals++;
		}
		expect(withProposals / ids).toBeLessThanOrEqual(0.01);
	});

	it('says why it proposes nothing for too few frames', () => {
		const payloads = Array.from({ length: 5 }, () => Uint8Array.of(1, 2));
		const result = proposeFields(idFramesFromPayloads(1, false, [0, 1, 2, 3, 4], payloads));
		expect(result.fields).toEqual([]);
		expect(result.notes[0]).toMatch(/too few/);
	});
});
