/**
 * Linking a receiver profile to a map revision: for each wanted channel, candidate signals ranked
 * by name and unit, then automatic links where one candidate clearly wins. Links fixed by hand
 * are kept as they are. docs/receivers.md explains the score.
 */
import type { CanMap, Frame, Signal } from '../map';
import { formatJsonPath } from '../map-json';
import { describeConversion, makeConversion } from './conversion';
import type {
	Candidate,
	LinkedChannel,
	LinkProblem,
	LinkReport,
	UnlinkedChannel
} from './link-report-schema';
import { channelText, type Link } from './link-schema';
import {
	createNameMatcher,
	impliedQuantity,
	matchNames,
	mergeSynonyms,
	type NameInfo,
	type NameMatcher,
	type SynonymTableInput
} from './names';
import type { ManualLink, ReceiverProfile, WantedChannel } from './profile';

export * from './link-schema';
export * from './link-report-schema';

/** Lowest score an automatic link needs. */
export const LINK_THRESHOLD = 0.6;
/** A runner-up closer than this to the best candidate makes the choice ambiguous. */
export const LINK_MARGIN = 0.05;

/** How much a needed conversion lowers a name score: an exact unit is the safest link. */
const UNIT_FACTOR = {
	identity: 1,
	units: 0.98,
	mixture: 0.97,
	reciprocal: 0.9
} as const;

export interface LinkOptions {
	/** A workspace's additions to the built-in synonyms. */
	synonyms?: SynonymTableInput;
	threshold?: number;
	margin?: number;
	/** Let two wanted channels link to the same signal (off: each signal feeds one channel). */
	allowShared?: boolean;
	/** Links fixed by hand; the profile's own `manualLinks` when absent. */
	manualLinks?: readonly ManualLink[];
	/** Candidates listed per channel (default 5). */
	maxCandidates?: number;
}

interface MapSignal {
	frame: Frame;
	signal: Signal;
	frameIndex: number;
	signalIndex: number;
	info: NameInfo;
}

const round3 = (x: number) => Math.round(x * 1000) / 1000;
const signalKey = (c: { frameIndex: number; signalIndex: number }) =>
	`${c.frameIndex}:${c.signalIndex}`;

function mapSignals(map: CanMap, matcher: NameMatcher): MapSignal[] {
	return map.frames.flatMap((frame, frameIndex) =>
		frame.signals.map((signal, signalIndex) => ({
			frame,
			signal,
			frameIndex,
			signalIndex,
			info: matcher.describe(signal.name)
		}))
	);
}

/** The conversion from a signal to a wanted channel, the signal's name telling a missing quantity. */
export function conversionFor(
	signal: Pick<Signal, 'unit'>,
	wanted: WantedChannel,
	signalName?: NameInfo
) {
	const hint = signal.unit.trim() === '' && signalName ? impliedQuantity(signalName) : undefined;
	return makeConversion(
		{ unit: signal.unit, quantity: hint },
		{ unit: wanted.unit, quantity: wanted.quantity },
		wanted.fuel
	);
}

function candidate(
	wanted: WantedChannel,
	wantedName: NameInfo,
	m: MapSignal,
	matcher: NameMatcher
): Candidate {
	const name = matchNames(matcher, wantedName, m.info);
	const converted = conversionFor(m.signal, wanted, m.info);
	const base = {
		frame: m.frame.name,
		id: m.frame.id,
		extended: m.frame.extended,
		signal: m.signal.name,
		frameIndex: m.frameIndex,
		signalIndex: m.signalIndex,
		nameScore: round3(name.score)
	};
	if (!converted.ok)
		return {
			...base,
			score: 0,
			reason: `${name.reason}; ${converted.message}`,
			conversion: null,
			problem: converted.message
		};
	const c = converted.conversion;
	const factor = c.form === 'reciprocal' ? UNIT_FACTOR.reciprocal : UNIT_FACTOR[c.kind];
	return {
		...base,
		score: round3(name.score * factor),
		reason: `${name.reason}; ${describeConversion(c)}`,
		conversion: c,
		problem: null
	};
}

/** One signal of a map scored as a candidate for a wanted channel. */
export function scoreCandidate(
	wanted: WantedChannel,
	map: CanMap,
	frameIndex: number,
	signalIndex: number,
	matcher: NameMatcher
): Candidate {
	const frame = map.frames[frameIndex];
	const signal = frame.signals[signalIndex];
	const m = { frame, signal, frameIndex, signalIndex, info: matcher.describe(signal.name) };
	return candidate(wanted, matcher.describe(wanted.name), m, matcher);
}

/**
 * Every signal worth showing for a wanted channel, best first: those that link (score > 0), then
 * well-named ones whose units do not convert, so a person sees why.
 */
export function rankCandidates(
	wanted: WantedChannel,
	map: CanMap,
	options: { synonyms?: SynonymTableInput; matcher?: NameMatcher; threshold?: number } = {}
): Candidate[] {
	const matcher = options.matcher ?? createNameMatcher(mergeSynonyms(options.synonyms));
	return rankWith(wanted, mapSignals(map, matcher), matcher, options.threshold ?? LINK_THRESHOLD);
}

function rankWith(
	wanted: WantedChannel,
	signals: readonly MapSignal[],
	matcher: NameMatcher,
	threshold: number
): Candidate[] {
	const wantedName = matcher.describe(wanted.name);
	const all = signals.map((m) => candidate(wanted, wantedName, m, matcher));
	const linkable = all.filter((c) => c.problem === null && c.score > 0);
	const refused = all.filter((c) => c.problem !== null && c.nameScore >= threshold);
	const order = (a: Candidate, b: Candidate) =>
		b.score - a.score || b.nameScore - a.nameScore || a.frameIndex - b.frameIndex;
	return [...linkable.sort(order), ...refused.sort(order)];
}

/** The signal a link or manual link names: the frame by ID when given (it survives a rename), else by name. */
export function findMapSignal(
	map: CanMap,
	ref: { frame: string; signal: string; id?: number; extended?: boolean }
): { frame: Frame; signal: Signal; frameIndex: number; signalIndex: number } | null {
	const byId =
		ref.id === undefined
			? -1
			: map.frames.findIndex((f) => f.id === ref.id && f.extended === (ref.extended ?? f.extended));
	const frameIndex = byId >= 0 ? byId : map.frames.findIndex((f) => f.name === ref.frame);
	if (frameIndex < 0) return null;
	const frame = map.frames[frameIndex];
	const signalIndex = frame.signals.findIndex((s) => s.name === ref.signal);
	return signalIndex < 0
		? null
		: { frame, signal: frame.signals[signalIndex], frameIndex, signalIndex };
}

/** A link made by hand, or why it cannot be made (no such frame or signal, units that do not convert). */
export function resolveManualLink(
	wanted: WantedChannel,
	map: CanMap,
	ref: { frame: string; signal: string },
	matcher: NameMatcher = createNameMatcher()
):
	| { ok: true; link: Link; reason: string }
	| { ok: false; field: 'frame' | 'signal' | 'wanted'; message: string } {
	const found = findMapSignal(map, ref);
	if (!found) {
		const frameKnown = map.frames.some((f) => f.name === ref.frame);
		return frameKnown
			? {
					ok: false,
					field: 'signal',
					message: `frame "${ref.frame}" of map "${map.name}" has no signal "${ref.signal}" (removed or renamed?), so "${wanted.name}" cannot link to it`
				}
			: {
					ok: false,
					field: 'frame',
					message: `map "${map.name}" has no frame "${ref.frame}" (removed or renamed?), so "${wanted.name}" cannot link to ${channelText(ref.frame, ref.signal)}`
				};
	}
	const converted = conversionFor(found.signal, wanted, matcher.describe(found.signal.name));
	if (!converted.ok)
		return {
			ok: false,
			field: 'wanted',
			message: `cannot link "${wanted.name}" (${wanted.unit || 'no unit'}) to ${channelText(found.frame.name, found.signal.name)} (${found.signal.unit || 'no unit'}): ${converted.message}`
		};
	return {
		ok: true,
		link: {
			wanted: wanted.name,
			frame: found.frame.name,
			id: found.frame.id,
			extended: found.frame.extended,
			signal: found.signal.name,
			conversion: converted.conversion,
			confidence: 1,
			manual: true
		},
		reason: `linked by hand; ${describeConversion(converted.conversion)}`
	};
}

/**
 * Links a profile to a map: manual links first, then automatic ones. A wanted channel links
 * automatically when its best free candidate scores at least `threshold` and no other free signal
 * comes within `margin` of it; the channels with the clearest best candidate choose first.
 */
export function linkProfile(
	profile: ReceiverProfile,
	map: CanMap,
	options: LinkOptions = {}
): LinkReport {
	const threshold = options.threshold ?? LINK_THRESHOLD;
	const margin = options.margin ?? LINK_MARGIN;
	const shown = options.maxCandidates ?? 5;
	const matcher = createNameMatcher(mergeSynonyms(options.synonyms));
	const signals = mapSignals(map, matcher);
	const manual = options.manualLinks ?? profile.manualLinks;

	const linked = new Map<string, LinkedChannel>();
	const unlinked = new Map<string, UnlinkedChannel>();
	const problems: LinkProblem[] = [];
	const taken = new Set<string>();
	const ranked = new Map(
		profile.wanted.map((w) => [w.name, rankWith(w, signals, matcher, threshold)])
	);
	const byName = (name: string) =>
		profile.wanted.find((w) => w.name.toLowerCase() === name.trim().toLowerCase());

	manual.forEach((ref, i) => {
		const wanted = byName(ref.wanted);
		const path = (field: string) => formatJsonPath(['manualLinks', i, field]);
		if (!wanted) {
			problems.push({
				wanted: ref.wanted,
				path: path('wanted'),
				message: `"${ref.wanted}" is not a wanted channel of profile "${profile.name}"`
			});
			return;
		}
		const resolved = resolveManualLink(wanted, map, ref, matcher);
		if (!resolved.ok) {
			// A broken hand-made link is reported, never quietly replaced by an automatic guess.
			problems.push({ wanted: wanted.name, path: path(resolved.field), message: resolved.message });
			unlinked.set(wanted.name, {
				wanted: wanted.name,
				required: wanted.required,
				reason: `its link made by hand cannot be made: ${resolved.message}`,
				candidates: ranked.get(wanted.name)!.slice(0, shown)
			});
			return;
		}
		const found = findMapSignal(map, resolved.link)!;
		taken.add(signalKey(found));
		linked.set(wanted.name, {
			wanted: wanted.name,
			required: wanted.required,
			link: resolved.link,
			reason: resolved.reason,
			candidates: ranked.get(wanted.name)!.slice(0, shown)
		});
	});

	const free = (c: Candidate) => options.allowShared || !taken.has(signalKey(c));
	const open = profile.wanted
		.filter((w) => !linked.has(w.name) && !unlinked.has(w.name))
		.map((w) => ({ wanted: w, candidates: ranked.get(w.name)! }))
		.sort((a, b) => (b.candidates[0]?.score ?? 0) - (a.candidates[0]?.score ?? 0));

	for (const { wanted, candidates } of open) {
		const usable = candidates.filter((c) => c.problem === null);
		const available = usable.filter(free);
		const [best, second] = available;
		const keep = (reason: string) =>
			unlinked.set(wanted.name, {
				wanted: wanted.name,
				required: wanted.required,
				reason,
				candidates: candidates.slice(0, shown)
			});
		if (!best) {
			keep(
				usable.length > 0
					? `every matching signal already feeds another wanted channel (${usable
							.slice(0, 3)
							.map((c) => channelText(c.frame, c.signal))
							.join(', ')})`
					: candidates.length > 0
						? `the signals named like it do not convert to ${wanted.unit || 'its unit'}: ${candidates[0].problem}`
						: 'no signal of the map matches its name with a unit that converts'
			);
			continue;
		}
		if (best.score < threshold) {
			keep(
				`best candidate ${channelText(best.frame, best.signal)} scores ${best.score}, below ${threshold}`
			);
			continue;
		}
		if (second && best.score - second.score < margin) {
			keep(
				`${channelText(best.frame, best.signal)} (${best.score}) and ${channelText(second.frame, second.signal)} (${second.score}) match about equally well; link one by hand`
			);
			continue;
		}
		taken.add(signalKey(best));
		linked.set(wanted.name, {
			wanted: wanted.name,
			required: wanted.required,
			link: {
				wanted: wanted.name,
				frame: best.frame,
				id: best.id,
				extended: best.extended,
				signal: best.signal,
				conversion: best.conversion!,
				confidence: best.score,
				manual: false
			},
			reason: best.reason,
			candidates: candidates.slice(0, shown)
		});
	}

	// Report in the profile's order, as a person reads the profile.
	const inOrder = <T>(items: Map<string, T>) =>
		profile.wanted.flatMap((w) => (items.has(w.name) ? [items.get(w.name)!] : []));
	return {
		profile: profile.name,
		map: map.name,
		links: inOrder(linked),
		unlinked: inOrder(unlinked),
		problems
	};
}

/** Required wanted channels left without a link (a receive set without them is incomplete). */
export function missingRequired(report: LinkReport): UnlinkedChannel[] {
	return report.unlinked.filter((u) => u.required);
}
