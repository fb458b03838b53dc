/**
 * Moving a profile's links from map revision A to revision B: each link is kept (same signal,
 * same decoding), changed (same signal, but its bits, scale, offset or unit differ) or broken (the
 * signal is gone — removed or renamed; the likeliest renamed signal is suggested). Pure, so the
 * review screen, the API and tests share it.
 */
import type { CanMap, Signal } from '../map';
import type { FieldChange } from '../map-diff';
import { composeScaling, describeConversion } from './conversion';
import {
	channelText,
	conversionFor,
	findMapSignal,
	LINK_THRESHOLD,
	rankCandidates,
	scoreCandidate,
	type Candidate,
	type Link
} from './linking';
import type { RelinkItem, RelinkResult } from './relink-result-schema';
import { createNameMatcher, mergeSynonyms, type SynonymTableInput } from './names';
import { findWanted, type ReceiverProfile } from './profile';

export * from './relink-result-schema';

/** The fields that change what a device decodes. */
const DECODING_FIELDS = [
	'startBit',
	'length',
	'byteOrder',
	'valueType',
	'scale',
	'offset',
	'unit',
	'muxValue'
] as const satisfies readonly (keyof Signal)[];

function signalChanges(a: Signal, b: Signal): FieldChange[] {
	return DECODING_FIELDS.filter((f) => a[f] !== b[f]).map((f) => ({
		field: f,
		from: a[f],
		to: b[f]
	}));
}

const changeText = (c: FieldChange) =>
	`${c.field} ${JSON.stringify(c.from)} → ${JSON.stringify(c.to)}`;

export function relinkProfile(
	profile: ReceiverProfile,
	links: readonly Link[],
	from: CanMap,
	to: CanMap,
	options: { synonyms?: SynonymTableInput } = {}
): RelinkResult {
	const matcher = createNameMatcher(mergeSynonyms(options.synonyms));
	const items = links.map((link): RelinkItem => {
		const old = findMapSignal(from, link);
		const now = findMapSignal(to, link);
		const wanted = findWanted(profile, link.wanted);
		const before = old ? composeScaling(old.signal, link.conversion) : null;
		const broken = (message: string, suggestion: RelinkItem['suggestion'] = null): RelinkItem => ({
			wanted: link.wanted,
			status: 'broken',
			before: link,
			after: null,
			changes: [],
			scaling: { before, after: null },
			suggestion,
			message
		});
		const where = channelText(link.frame, link.signal);
		if (!wanted)
			return broken(`"${link.wanted}" is no longer a wanted channel of profile "${profile.name}"`);

		if (!now) {
			const suggestion = suggestRename(wanted, link, old?.signal ?? null, from, to, matcher);
			return broken(
				`${where} is not in "${to.name}" any more (removed or renamed)${suggestion ? `; ${suggestion.evidence}` : '; no signal of the new revision looks like it'}`,
				suggestion
			);
		}
		const changes = old ? signalChanges(old.signal, now.signal) : [];
		if (old && (old.frame.id !== now.frame.id || old.frame.extended !== now.frame.extended))
			changes.unshift({ field: 'id', from: old.frame.id, to: now.frame.id });
		const converted = conversionFor(now.signal, wanted, matcher.describe(now.signal.name));
		if (!converted.ok)
			return {
				...broken(
					`${where} now has unit "${now.signal.unit}", which does not give "${wanted.name}" its ${wanted.unit || 'unit'}: ${converted.message}`
				),
				changes
			};
		const after: Link = {
			...link,
			frame: now.frame.name,
			id: now.frame.id,
			extended: now.frame.extended,
			conversion: converted.conversion
		};
		const scaling = { before, after: composeScaling(now.signal, converted.conversion) };
		const renamedFrame =
			old && old.frame.name !== now.frame.name ? ` (frame now named "${now.frame.name}")` : '';
		if (changes.length === 0)
			return {
				wanted: link.wanted,
				status: 'kept',
				before: link,
				after,
				changes,
				scaling,
				suggestion: null,
				message: `"${wanted.name}" keeps ${where}${renamedFrame}`
			};
		return {
			wanted: link.wanted,
			status: 'changed',
			before: link,
			after,
			changes,
			scaling,
			suggestion: null,
			message: `"${wanted.name}": ${where} changed ${changes.map(changeText).join(', ')}${renamedFrame}; the device needs ${describeConversion(converted.conversion)} with scale ${scaling.after.scale} and offset ${scaling.after.offset}`
		};
	});
	const counts = { kept: 0, changed: 0, broken: 0 };
	for (const item of items) counts[item.status]++;
	return { items, counts };
}

/**
 * The likeliest new name of a vanished signal: a signal new in B, in the frame with the same ID,
 * on the very same bits is strong evidence; otherwise the best-named new signal above the link
 * threshold.
 */
function suggestRename(
	wanted: NonNullable<ReturnType<typeof findWanted>>,
	link: Link,
	oldSignal: Signal | null,
	from: CanMap,
	to: CanMap,
	matcher: ReturnType<typeof createNameMatcher>
): RelinkItem['suggestion'] {
	const isNew = (c: Candidate) => findMapSignal(from, c) === null;
	if (oldSignal) {
		// Same frame ID, same bits: evidence even when the new name shares no word with the old.
		const frameIndex = to.frames.findIndex((f) => f.id === link.id && f.extended === link.extended);
		const frame = to.frames[frameIndex];
		const sameBits = (frame?.signals ?? [])
			.map((s, signalIndex) => ({ s, signalIndex }))
			.filter(
				({ s }) =>
					s.startBit === oldSignal.startBit &&
					s.length === oldSignal.length &&
					s.byteOrder === oldSignal.byteOrder
			)
			.map(({ signalIndex }) => scoreCandidate(wanted, to, frameIndex, signalIndex, matcher))
			.find((c) => c.problem === null && isNew(c));
		if (sameBits)
			return {
				...sameBits,
				evidence: `${channelText(sameBits.frame, sameBits.signal)} is new and sits on the same bits of the same frame (start bit ${oldSignal.startBit}, ${oldSignal.length} bits): probably "${link.signal}" renamed`
			};
	}
	const candidates = rankCandidates(wanted, to, { matcher }).filter(
		(c) => c.problem === null && isNew(c)
	);
	const best = candidates.find((c) => c.score >= LINK_THRESHOLD);
	return best
		? {
				...best,
				evidence: `${channelText(best.frame, best.signal)} is new and its name matches (score ${best.score})`
			}
		: null;
}
