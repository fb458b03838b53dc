/**
 * What the capture page shows of field proposals (docs/field-proposals.md) and how a chosen one
 * becomes a signal of the map draft: the bits each proposal covers (to outline them over the bit
 * activity), a short line of evidence per kind, a default name, and the signal with its role and
 * the evidence in its comment.
 */
import { fieldBits } from '$lib/can/fields/chain';
import type { FieldKind, FieldProposal } from '$lib/can/fields/proposal';
import type { SignalInput } from '$lib/can/map';

export const KIND_LABEL: Record<FieldKind, string> = {
	constant: 'Constant',
	counter: 'Counter',
	checksum: 'Checksum',
	mux: 'Multiplexor',
	value: 'Value'
};

/** One letter per kind, drawn in the bit cells a proposal covers. */
export const KIND_LETTER: Record<FieldKind, string> = {
	constant: 'K',
	counter: 'C',
	checksum: 'S',
	mux: 'M',
	value: 'V'
};

const ALGORITHM: Record<string, string> = {
	xor: 'XOR',
	sum: 'sum modulo 256',
	'crc8-sae-j1850': 'CRC-8 SAE J1850',
	'crc8-autosar': 'CRC-8 AUTOSAR (0x2F)'
};

const pct = (share: number) => `${(share * 100).toFixed(share >= 0.999 && share < 1 ? 2 : 1)} %`;
const hex = (v: number) => `0x${v.toString(16).toUpperCase()}`;

/** The kind's figures in a few words: what a person checks first. */
export function proposalSummary(p: FieldProposal): string {
	switch (p.kind) {
		case 'constant':
			return `always ${hex(p.value)} (${p.value})`;
		case 'counter':
			return `step ${p.step} modulo ${2 ** p.length}, ${pct(p.share)} of ${p.pairs.toLocaleString('en')} frame pairs`;
		case 'checksum':
			return `${ALGORITHM[p.algorithm] ?? p.algorithm}${p.dataId === null ? '' : ` with data ID ${hex(p.dataId)}`}${p.clearedBits.length ? `, counter bits read as 0` : ''}; explains ${pct(p.share)} of frames`;
		case 'mux':
			return `pages ${p.pages.map((g) => g.value).join(', ')}${p.counterStep ? ` (sent in turn, step ${p.counterStep})` : ''}`;
		case 'value':
			return `${p.byteOrder === 'little' ? 'little' : 'big'}-endian, ${p.signed ? 'signed' : 'unsigned'}, raw ${p.rawMin} … ${p.rawMax}`;
	}
}

/** Payload bits → the index of the first proposal (on every frame, else the first page's) covering it. */
export function proposalMarks(
	fields: readonly FieldProposal[],
	payloadLength: number
): Map<number, number> {
	const marks = new Map<number, number>();
	const order = fields
		.map((f, i) => ({ f, i }))
		.sort((a, b) => Number(a.f.muxValue !== null) - Number(b.f.muxValue !== null) || a.i - b.i);
	for (const { f, i } of order)
		for (const bit of fieldBits(f.startBit, f.length, f.byteOrder, payloadLength))
			if (bit >= 0 && !marks.has(bit)) marks.set(bit, i);
	return marks;
}

/** A name an editor can keep or change: kind and start bit, page when it has one. */
export function defaultSignalName(p: FieldProposal): string {
	const base = `${KIND_LABEL[p.kind]}_${p.startBit}`;
	return p.muxValue === null ? base : `${base}_p${p.muxValue}`;
}

/** A correlation's proposed name and scaling for one value field of an ID. */
export interface Suggestion {
	startBit: number;
	length: number;
	byteOrder: 'little' | 'big';
	muxValue: number | null;
	name: string;
	scale: number;
	offset: number;
	unit: string;
}

/** Values, counters, checksums and selectors are ticked at first; constants (usually padding) not. */
export const selectedByDefault = (p: FieldProposal) => p.kind !== 'constant';

/** The draft signal of an accepted proposal: its bits, role, scaling and the evidence as comment. */
export function signalFromProposal(
	p: FieldProposal,
	edit: { name: string; scale?: number; offset?: number; unit?: string }
): SignalInput {
	const evidence = `Accepted from a field proposal (${KIND_LABEL[p.kind].toLowerCase()}, confidence ${p.confidence.toFixed(2)}): ${proposalSummary(p)}. ${p.evidence}`;
	const signal: SignalInput = {
		name: edit.name.trim(),
		startBit: p.startBit,
		length: p.length,
		byteOrder: p.byteOrder,
		valueType: p.kind === 'value' && p.signed ? 'signed' : 'unsigned',
		role: p.kind === 'counter' ? 'counter' : p.kind === 'checksum' ? 'checksum' : 'value',
		multiplexer: p.kind === 'mux',
		muxValue: p.kind === 'mux' ? null : p.muxValue,
		comment: evidence.slice(0, 2000)
	};
	if (p.kind === 'value') {
		signal.scale = edit.scale ?? 1;
		signal.offset = edit.offset ?? 0;
		signal.unit = edit.unit ?? '';
	}
	return signal;
}

/** A map draft accepted proposals may go to, with the version an accept must name. */
export interface DraftTarget {
	mapId: string;
	mapName: string;
	version: number;
}

/**
 * The draft an accept goes to: the one chosen in the map picker, else the decode's map (also when
 * the chosen map has since left the list).
 */
export function acceptTarget(
	answer: { draft: DraftTarget; drafts: readonly DraftTarget[] },
	chosenMapId: string
): DraftTarget {
	return answer.drafts.find((d) => d.mapId === chosenMapId) ?? answer.draft;
}

/** After an accept: every entry of that map reads the draft's new version, so the next accept is not stale. */
export function withDraftVersion(
	answer: { draft: DraftTarget; drafts: DraftTarget[] },
	mapId: string,
	version: number
): void {
	for (const d of [answer.draft, ...answer.drafts]) if (d.mapId === mapId) d.version = version;
}
