/**
 * Field proposals for the frames of one ID: constants first, then counters, checksums, a
 * multiplexor (with per-page constants and values) and finally measured values, each detector
 * working on the bits the earlier ones left unexplained. docs/field-proposals.md describes the rules.
 */
import type { FrameStore } from '../capture/frame-store';
import {
	bitStatistics,
	isConstantBit,
	modalFrameSet,
	subset,
	type BitStatistics,
	type FrameSet
} from './bit-statistics';
import { fieldBits } from './chain';
import { findChecksums } from './checksums';
import { findConstants } from './constants';
import { findCounters } from './counters';
import { framesById, type IdFrames } from './frames';
import { findMux } from './mux';
import type { FieldProposal, IdProposals, ValueProposal } from './proposal';
import { describeValue, findValues } from './values';

/** Fewer analysed frames than this give no proposals. */
export const MIN_FRAMES = 20;
/** Constants per multiplexor page need at least this many frames of the page. */
export const MIN_PAGE_FRAMES_FOR_CONSTANTS = 24;

const KIND_ORDER: FieldProposal['kind'][] = ['mux', 'counter', 'checksum', 'constant', 'value'];

function bitsOf(p: FieldProposal, payloadLength: number): number[] {
	return fieldBits(p.startBit, p.length, p.byteOrder, payloadLength);
}

/**
 * One page of a multiplexed frame: bits constant on the page (but not everywhere) and values on the
 * page, among the bits no earlier detector claimed.
 */
function perPage(set: FrameSet, value: number, frames: Uint32Array, claimed: Uint8Array) {
	const page = subset(set, frames);
	const stats = bitStatistics(page);
	const bits = set.length * 8;
	const constantEligible = new Uint8Array(bits);
	const valueEligible = new Uint8Array(bits);
	for (let b = 0; b < bits; b++) {
		if (claimed[b]) continue;
		if (isConstantBit(stats, b)) constantEligible[b] = 1;
		else valueEligible[b] = 1;
	}
	return {
		constants:
			page.count >= MIN_PAGE_FRAMES_FOR_CONSTANTS
				? findConstants(page, stats, constantEligible, value)
				: [],
		values: page.count >= MIN_FRAMES ? findValues(page, stats, valueEligible, value) : []
	};
}

const sameBits = (a: ValueProposal, b: ValueProposal) =>
	a.startBit === b.startBit && a.length === b.length && a.byteOrder === b.byteOrder;

/**
 * A value found with the same bits on every page is not multiplexed: one proposal for all frames
 * (read again over every frame for its range, signedness and flip rates).
 */
function mergeCommonValues(
	set: FrameSet,
	stats: BitStatistics,
	perPageValues: ValueProposal[][]
): { common: ValueProposal[]; paged: ValueProposal[] } {
	const [first, ...rest] = perPageValues;
	const common: ValueProposal[] = [];
	const paged: ValueProposal[] = [];
	const isCommon = (v: ValueProposal) => rest.every((page) => page.some((w) => sameBits(v, w)));
	for (const v of first ?? []) {
		if (!isCommon(v)) continue;
		const confidence = Math.min(
			...perPageValues.map((page) => page.find((w) => sameBits(v, w))!.confidence)
		);
		const why = `found with the same bits on each of the ${perPageValues.length} pages`;
		common.push(describeValue(set, stats, v, confidence, null, why));
	}
	for (const page of perPageValues) {
		paged.push(...page.filter((v) => !common.some((c) => sameBits(c, v))));
	}
	return { common, paged };
}

export function proposeFields(frames: IdFrames): IdProposals {
	const set = modalFrameSet(frames);
	const L = set.length;
	const notes: string[] = [];
	const result = (fields: FieldProposal[]): IdProposals => ({
		id: frames.id,
		extended: frames.extended,
		frames: frames.count,
		analysedFrames: set.count,
		payloadLength: L,
		fields,
		notes
	});
	if (set.count < frames.count) {
		notes.push(
			`${frames.count - set.count} frame(s) with a payload length other than ${L} byte(s) were left out`
		);
	}
	if (L === 0) {
		notes.push('the frames carry no payload');
		return result([]);
	}
	if (set.count < MIN_FRAMES) {
		notes.push(
			`${set.count} frame(s) are too few to propose fields (at least ${MIN_FRAMES} needed)`
		);
		return result([]);
	}

	const bits = L * 8;
	const stats = bitStatistics(set);
	const claimed = new Uint8Array(bits);
	const everyBit = new Uint8Array(bits).fill(1);
	const constants = findConstants(set, stats, everyBit, null);
	for (const c of constants) for (let i = 0; i < c.length; i++) claimed[c.startBit + i] = 1;

	let counters = findCounters(set, stats, claimed);
	const counterBits = counters.flatMap((c) => bitsOf(c, L));
	const checksums = findChecksums(set, stats, claimed, counterBits);

	const selectable = new Uint8Array(bits);
	const other = new Uint8Array(bits);
	const checksumBits = new Set(checksums.flatMap((c) => bitsOf(c, L)));
	for (let b = 0; b < bits; b++) {
		selectable[b] = !isConstantBit(stats, b) && !checksumBits.has(b) ? 1 : 0;
		other[b] = claimed[b] ? 0 : 1;
	}
	const mux = findMux(set, stats, selectable, other, counters);
	let values: ValueProposal[];
	const paged: FieldProposal[] = [];
	if (mux) {
		counters = counters.filter((c) => c !== mux.counter);
		for (let i = 0; i < mux.proposal.length; i++) claimed[mux.proposal.startBit + i] = 1;
		const perPageValues: ValueProposal[][] = [];
		for (const [value, indices] of mux.pages) {
			const page = perPage(set, value, indices, claimed);
			paged.push(...page.constants);
			perPageValues.push(page.values);
		}
		const merged = mergeCommonValues(set, stats, perPageValues);
		values = merged.common;
		paged.push(...merged.paged);
	} else {
		const eligible = new Uint8Array(bits);
		for (let b = 0; b < bits; b++) eligible[b] = claimed[b] ? 0 : 1;
		values = findValues(set, stats, eligible, null);
	}

	const fields: FieldProposal[] = [
		...(mux ? [mux.proposal] : []),
		...counters,
		...checksums,
		...constants,
		...values,
		...paged
	];
	const lowestBit = (p: FieldProposal) => Math.min(...bitsOf(p, L));
	fields.sort(
		(a, b) =>
			(a.muxValue ?? -1) - (b.muxValue ?? -1) ||
			lowestBit(a) - lowestBit(b) ||
			KIND_ORDER.indexOf(a.kind) - KIND_ORDER.indexOf(b.kind)
	);
	return result(fields);
}

/** Proposals for every ID of a capture, or those `select` keeps, sorted by (extended, id). */
export function proposeCaptureFields(
	store: FrameStore,
	select?: (id: number, extended: boolean) => boolean
): IdProposals[] {
	return framesById(store, select).map(proposeFields);
}
