import { describe, expect, it } from 'vitest';
import type { FieldProposal } from '$lib/can/fields/proposal';
import { signalSchema } from '$lib/can/map';
import {
	acceptTarget,
	defaultSignalName,
	proposalMarks,
	proposalSummary,
	selectedByDefault,
	signalFromProposal,
	withDraftVersion
} from './field-proposal-view';

const common = { confidence: 0.99, muxValue: null, evidence: 'seen in every frame' };
const counter: FieldProposal = {
	kind: 'counter',
	startBit: 48,
	length: 4,
	byteOrder: 'little',
	step: 1,
	share: 1,
	pairs: 999,
	...common
};
const checksum: FieldProposal = {
	kind: 'checksum',
	startBit: 56,
	length: 8,
	byteOrder: 'little',
	algorithm: 'crc8-sae-j1850',
	dataId: null,
	inputBytes: [0, 1, 2, 3, 4, 5, 6],
	clearedBits: [],
	share: 1,
	alternativeBytes: [],
	...common
};
const value: FieldProposal = {
	kind: 'value',
	startBit: 8,
	length: 16,
	byteOrder: 'big',
	signed: true,
	rawMin: -300,
	rawMax: 1200,
	flipRates: [],
	...common,
	muxValue: 2
};
const constant: FieldProposal = {
	kind: 'constant',
	startBit: 32,
	length: 8,
	byteOrder: 'little',
	value: 0x5a,
	...common
};

describe('field proposals on the capture page', () => {
	it('marks the bits each proposal covers, big-endian across the byte before (docs/bit-numbering.md)', () => {
		const marks = proposalMarks([counter, value], 8);
		// docs/bit-numbering.md: a big-endian field filling bytes k … k+m−1 has startBit 8·(k+m−1),
		// so start bit 8, 16 bits = bytes 0 and 1.
		const expected = new Map<number, number>();
		for (let b = 48; b < 52; b++) expected.set(b, 0);
		for (let b = 0; b < 16; b++) expected.set(b, 1);
		expect(marks).toEqual(expected);
	});

	it('turns proposals into draft signals with role, type and the evidence in the comment', () => {
		const s = signalSchema.parse(
			signalFromProposal(value, { name: 'Speed', scale: 0.5, offset: 25 })
		);
		expect(s).toMatchObject({
			name: 'Speed',
			startBit: 8,
			length: 16,
			byteOrder: 'big',
			valueType: 'signed',
			scale: 0.5,
			offset: 25,
			role: 'value',
			muxValue: 2
		});
		expect(s.comment).toContain('seen in every frame');
		expect(
			signalSchema.parse(signalFromProposal(counter, { name: 'Alive', scale: 3 }))
		).toMatchObject({ role: 'counter', scale: 1, valueType: 'unsigned' });
		expect(signalSchema.parse(signalFromProposal(checksum, { name: 'Crc' })).role).toBe('checksum');
		expect(proposalSummary(checksum)).toContain('CRC-8 SAE J1850');
		expect(proposalSummary(constant)).toBe('always 0x5A (90)');
		expect(defaultSignalName(value)).toBe('Value_8_p2');
		expect([counter, checksum, value, constant].map(selectedByDefault)).toEqual([
			true,
			true,
			true,
			false
		]);
	});
});

describe('the map an accept goes to', () => {
	const answer = () => ({
		draft: { mapId: 'm1', mapName: 'Engine', version: 4 },
		drafts: [
			{ mapId: 'm2', mapName: 'Chassis', version: 9 },
			{ mapId: 'm1', mapName: 'Engine', version: 4 }
		]
	});

	it('is the chosen map with its own draft version, else the decode’s map', () => {
		expect(acceptTarget(answer(), 'm2')).toEqual({ mapId: 'm2', mapName: 'Chassis', version: 9 });
		expect(acceptTarget(answer(), '')).toEqual(answer().draft);
		expect(acceptTarget(answer(), 'deleted-map')).toEqual(answer().draft);
	});

	it('reads the new draft version after an accept, in every entry of that map only', () => {
		const a = answer();
		withDraftVersion(a, 'm1', 5);
		expect([a.draft.version, a.drafts[0].version, a.drafts[1].version]).toEqual([5, 9, 5]);
		withDraftVersion(a, 'm2', 10);
		expect([a.draft.version, a.drafts[0].version, a.drafts[1].version]).toEqual([5, 10, 5]);
	});
});
