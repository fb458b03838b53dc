/**
 * What is on the bus, identifier by identifier: how often each ID was seen, at what rate and with
 * how much timing jitter (compared with the cycle time the map promises), and for IDs the map does
 * not define, how often each payload bit changed — the first clue to what an unknown frame carries.
 */
import type { CompiledMap } from '../decoder';
import type { FrameColumns } from './frame-columns';
import { FLAG_EXTENDED } from './frame-store';

export interface IdStatistics {
	/** The bus it was seen on (index into the capture's bus names; 0 without a bus column). */
	bus: number;
	id: number;
	extended: boolean;
	count: number;
	firstTime: number;
	lastTime: number;
	/** Frames per second over the span from first to last frame; null with fewer than 2 frames. */
	rateHz: number | null;
	/** Mean gap between consecutive frames of this ID, in ms; null with fewer than 2 frames. */
	meanPeriodMs: number | null;
	/** Population standard deviation of those gaps, in ms. */
	jitterMs: number | null;
	minLength: number;
	maxLength: number;
	/** The map frame that decodes this ID, or null when the map does not define it. */
	frameIndex: number | null;
	frameName: string | null;
	cycleMs: number | null;
}

export interface UnknownId {
	bus: number;
	id: number;
	extended: boolean;
	count: number;
	maxLength: number;
	/** changes[b] = how many times payload bit b (docs/bit-numbering.md) differed from the previous frame of this ID. */
	bitChanges: Uint32Array;
}

export interface IdSurvey {
	/** Every (bus, ID) seen, sorted by (bus, extended, id): one ID on two buses is two entries. */
	ids: IdStatistics[];
	/** IDs the map does not define, same order. */
	unknownIds: UnknownId[];
}

interface Tally {
	bus: number;
	id: number;
	extended: boolean;
	count: number;
	firstTime: number;
	lastTime: number;
	// Welford's running mean and sum of squared deviations of the gaps (numerically stable).
	gapMean: number;
	gapM2: number;
	minLength: number;
	maxLength: number;
	unknown: { previous: Uint8Array; previousLength: number; bitChanges: Uint32Array } | null;
}

export function surveyIds(store: FrameColumns, compiled: CompiledMap): IdSurvey {
	const survey = createIdSurvey(compiled);
	survey.add(store);
	return survey.finish();
}

/**
 * The survey fed a capture piece by piece in capture order (segments of the chunked store). Columns
 * with a bus column (a segment's) are counted per bus: rates and gaps of one ID on two buses are
 * two series, never merged.
 */
export function createIdSurvey(compiled: CompiledMap): {
	add(columns: FrameColumns & { readonly bus?: Uint8Array }): void;
	finish(): IdSurvey;
} {
	const tallies = new Map<number, Tally>();
	const add = (store: FrameColumns & { readonly bus?: Uint8Array }) => {
		const { time, id, flags, length, dataOffset, data } = store;
		const buses = store.bus;
		// The previous frame's tally (a chunk of the store is one ID: one lookup for all its frames).
		let lastKey = -1;
		let last: Tally | undefined;
		for (let i = 0; i < store.count; i++) {
			const extended = (flags[i] & FLAG_EXTENDED) !== 0;
			const bus = buses ? buses[i] : 0;
			// IDs are below 2^29: (bus, extended, id) as one exact number.
			const key = bus * 0x40000000 + (extended ? id[i] + 0x20000000 : id[i]);
			let t = key === lastKey ? last : tallies.get(key);
			lastKey = key;
			if (t === undefined) {
				t = {
					bus,
					id: id[i],
					extended,
					count: 0,
					firstTime: time[i],
					lastTime: time[i],
					gapMean: 0,
					gapM2: 0,
					minLength: length[i],
					maxLength: length[i],
					unknown: compiled.lookup(id[i], extended)
						? null
						: {
								previous: new Uint8Array(64),
								previousLength: 0,
								bitChanges: new Uint32Array(64 * 8)
							}
				};
				tallies.set(key, t);
			} else {
				const gap = time[i] - t.lastTime;
				const n = t.count; // gaps so far + 1
				const delta = gap - t.gapMean;
				t.gapMean += delta / n;
				t.gapM2 += delta * (gap - t.gapMean);
				t.lastTime = time[i];
			}
			last = t;
			t.count++;
			if (length[i] < t.minLength) t.minLength = length[i];
			if (length[i] > t.maxLength) t.maxLength = length[i];
			const u = t.unknown;
			if (u) {
				const at = dataOffset[i];
				const n = length[i];
				if (t.count > 1) {
					const common = Math.min(n, u.previousLength);
					for (let b = 0; b < common; b++) {
						let changed = data[at + b] ^ u.previous[b];
						while (changed !== 0) {
							const low = changed & -changed;
							u.bitChanges[b * 8 + 31 - Math.clz32(low)]++;
							changed ^= low;
						}
					}
				}
				u.previous.set(data.subarray(at, at + n));
				u.previousLength = n;
			}
		}
	};
	const finish = (): IdSurvey => {
		const sorted = [...tallies.values()].sort(
			(a, b) => a.bus - b.bus || Number(a.extended) - Number(b.extended) || a.id - b.id
		);
		const ids = sorted.map((t): IdStatistics => {
			const frame = t.unknown ? undefined : compiled.lookup(t.id, t.extended);
			const gaps = t.count - 1;
			const span = t.lastTime - t.firstTime;
			return {
				bus: t.bus,
				id: t.id,
				extended: t.extended,
				count: t.count,
				firstTime: t.firstTime,
				lastTime: t.lastTime,
				rateHz: gaps > 0 && span > 0 ? gaps / span : null,
				meanPeriodMs: gaps > 0 ? t.gapMean * 1000 : null,
				jitterMs: gaps > 0 ? Math.sqrt(t.gapM2 / gaps) * 1000 : null,
				minLength: t.minLength,
				maxLength: t.maxLength,
				frameIndex: frame ? frame.frameIndex : null,
				frameName: frame ? frame.frame.name : null,
				cycleMs: frame ? frame.frame.cycleMs : null
			};
		});
		const unknownIds = sorted
			.filter((t) => t.unknown !== null)
			.map((t) => ({
				bus: t.bus,
				id: t.id,
				extended: t.extended,
				count: t.count,
				maxLength: t.maxLength,
				bitChanges: t.unknown!.bitChanges.slice(0, t.maxLength * 8)
			}));
		return { ids, unknownIds };
	};
	return { add, finish };
}
