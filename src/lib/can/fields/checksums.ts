/**
 * Checksums: a payload byte equal to a standard function of the other bytes (in byte order), with
 * or without a data-ID byte fed first and with or without a counter's bits cleared.
 *
 * Rather than trying all 256 data IDs per frame, each frame gives the one "key" its checksum byte
 * implies: XOR and sum reduce to byte ⊕/− f(others); a CRC is affine over GF(2), so
 * CRC(id ‖ data) = R(id) ⊕ CRC₀(data) ⊕ xorout, where CRC₀ runs from a zero register and R(id) is
 * the register the ID and the zero bytes leave. A checksum makes the key the same in (nearly) every
 * frame; the data ID is then the one of the 256 values whose R(id) equals that key.
 */
import { isConstantBit, type BitStatistics, type FrameSet } from './bit-statistics';
import { CRC8_AUTOSAR, CRC8_SAE_J1850, crc8Register, crc8Table, type Crc8Parameters } from './crc8';
import type { ChecksumAlgorithm, ChecksumProposal } from './proposal';
import { percent, round4, wilsonLower } from './statistics';

export const CHECKSUM_MIN_SHARE = 0.8;
/** Frames tried first; a candidate whose commonest key holds in under half of them is dropped. */
const SAMPLE_FRAMES = 64;

const ALGORITHMS: ChecksumAlgorithm[] = ['xor', 'sum', 'crc8-sae-j1850', 'crc8-autosar'];
const CRC: Partial<Record<ChecksumAlgorithm, Crc8Parameters>> = {
	'crc8-sae-j1850': CRC8_SAE_J1850,
	'crc8-autosar': CRC8_AUTOSAR
};
const LABEL: Record<ChecksumAlgorithm, string> = {
	xor: 'the XOR',
	sum: 'the sum modulo 256',
	'crc8-sae-j1850': 'CRC-8/SAE-J1850',
	'crc8-autosar': 'CRC-8/AUTOSAR'
};

/** Key of frame k: what the checksum byte implies once the function of the other bytes is removed. */
function frameKey(
	set: FrameSet,
	k: number,
	position: number,
	algorithm: ChecksumAlgorithm,
	keep: Uint8Array,
	table: Uint8Array | null
): number {
	const L = set.length;
	const at = k * L;
	let acc = 0;
	for (let b = 0; b < L; b++) {
		if (b === position) continue;
		const v = set.bytes[at + b] & keep[b];
		if (algorithm === 'xor') acc ^= v;
		else if (algorithm === 'sum') acc += v;
		else acc = table![acc ^ v];
	}
	const c = set.bytes[at + position];
	if (algorithm === 'xor') return c ^ acc;
	if (algorithm === 'sum') return (c - acc) & 0xff;
	return c ^ CRC[algorithm]!.xorout ^ acc;
}

/** The key a frame without a data ID gives, and the key of each data ID (index = ID). */
function idKeys(
	algorithm: ChecksumAlgorithm,
	inputLength: number
): { none: number; byId: Uint8Array } {
	const byId = new Uint8Array(256);
	const parameters = CRC[algorithm];
	if (!parameters) {
		for (let id = 0; id < 256; id++) byId[id] = id;
		return { none: 0, byId };
	}
	const table = crc8Table(parameters.poly);
	const zeros = new Uint8Array(inputLength);
	for (let id = 0; id < 256; id++) {
		byId[id] = crc8Register(table, table[parameters.init ^ id], zeros);
	}
	return { none: crc8Register(table, parameters.init, zeros), byId };
}

interface Finding {
	position: number;
	algorithm: ChecksumAlgorithm;
	dataId: number | null;
	clearedBits: number[];
	explained: number;
}

function tryChecksum(
	set: FrameSet,
	position: number,
	algorithm: ChecksumAlgorithm,
	clearedBits: number[]
): Finding | null {
	const { count, length: L } = set;
	const keep = new Uint8Array(L).fill(0xff);
	for (const bit of clearedBits) keep[bit >> 3] &= ~(1 << (bit & 7));
	const parameters = CRC[algorithm];
	const table = parameters ? crc8Table(parameters.poly) : null;
	const histogram = new Uint32Array(256);
	// Quick look at frames spread over the capture before reading them all.
	const sample = Math.min(count, SAMPLE_FRAMES);
	let top = 0;
	for (let s = 0; s < sample; s++) {
		const k = Math.floor((s * count) / sample);
		top = Math.max(top, ++histogram[frameKey(set, k, position, algorithm, keep, table)]);
	}
	if (top < 0.5 * sample) return null;
	histogram.fill(0);
	for (let k = 0; k < count; k++) histogram[frameKey(set, k, position, algorithm, keep, table)]++;
	const { none, byId } = idKeys(algorithm, L - 1);
	const needed = CHECKSUM_MIN_SHARE * count;
	if (histogram[none] >= needed) {
		return { position, algorithm, dataId: null, clearedBits, explained: histogram[none] };
	}
	let mode = 0;
	for (let key = 1; key < 256; key++) if (histogram[key] > histogram[mode]) mode = key;
	if (histogram[mode] < needed) return null;
	const dataId = byId.indexOf(mode); // R(id) is a bijection, so exactly one ID gives each key
	return { position, algorithm, dataId, clearedBits, explained: histogram[mode] };
}

/** Explains more frames; at equal count, needs no data ID, then clears no bits. */
function better(a: Finding, b: Finding | null): boolean {
	if (b === null || a.explained !== b.explained) return b === null || a.explained > b.explained;
	if ((a.dataId === null) !== (b.dataId === null)) return a.dataId === null;
	return a.clearedBits.length < b.clearedBits.length;
}

function byteRange(bytes: number[]): string {
	const parts: string[] = [];
	for (let i = 0; i < bytes.length;) {
		let j = i;
		while (j + 1 < bytes.length && bytes[j + 1] === bytes[j] + 1) j++;
		parts.push(j === i ? `${bytes[i]}` : `${bytes[i]}–${bytes[j]}`);
		i = j + 1;
	}
	return `byte${bytes.length === 1 ? '' : 's'} ${parts.join(', ')}`;
}

/**
 * Checksum bytes among the bytes with no `claimed` bit and at least one changing bit; `counterBits`
 * are the bits of counters found before, tried both fed in and cleared. Marks each found byte in `claimed`.
 */
export function findChecksums(
	set: FrameSet,
	stats: BitStatistics,
	claimed: Uint8Array,
	counterBits: number[]
): ChecksumProposal[] {
	const { count, length: L } = set;
	if (L < 2 || count < 2) return [];
	const eligible: number[] = [];
	for (let b = 0; b < L; b++) {
		let changing = false;
		let free = true;
		for (let j = 0; j < 8; j++) {
			if (claimed[b * 8 + j]) free = false;
			if (!isConstantBit(stats, b * 8 + j)) changing = true;
		}
		if (free && changing) eligible.push(b);
	}
	const findings: Finding[] = [];
	for (const position of eligible) {
		const outside = counterBits.filter((bit) => bit >> 3 !== position);
		let best: Finding | null = null;
		for (const algorithm of ALGORITHMS) {
			for (const cleared of outside.length ? [[], outside] : [[]]) {
				const f = tryChecksum(set, position, algorithm, cleared);
				if (f && better(f, best)) best = f;
			}
		}
		if (best) findings.push(best);
	}
	// An XOR relation holds for every byte it covers; report it once, at the last of them.
	const xor = findings.filter((f) => f.algorithm === 'xor');
	const kept = findings.filter((f) => f.algorithm !== 'xor');
	if (xor.length) kept.push(xor[xor.length - 1]);

	return kept
		.sort((a, b) => a.position - b.position)
		.map((f) => {
			for (let j = 0; j < 8; j++) claimed[f.position * 8 + j] = 1;
			const inputBytes = Array.from({ length: L }, (_, b) => b).filter((b) => b !== f.position);
			const share = f.explained / count;
			const alternativeBytes =
				f.algorithm === 'xor' ? xor.map((x) => x.position).filter((p) => p !== f.position) : [];
			const id =
				f.dataId === null
					? ''
					: `data ID ${f.dataId} (0x${f.dataId.toString(16).padStart(2, '0')}) then `;
			const cleared = f.clearedBits.length ? ` with the counter bits read as 0` : '';
			return {
				kind: 'checksum' as const,
				startBit: f.position * 8,
				length: 8,
				byteOrder: 'little' as const,
				confidence: round4(wilsonLower(f.explained, count)),
				muxValue: null,
				evidence: `equals ${LABEL[f.algorithm]} of ${id}${byteRange(inputBytes)}${cleared} in ${percent(share)} of ${count} frames`,
				algorithm: f.algorithm,
				dataId: f.dataId,
				inputBytes,
				clearedBits: f.clearedBits,
				share: round4(share),
				alternativeBytes
			};
		});
}
