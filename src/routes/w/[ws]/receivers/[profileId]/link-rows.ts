/**
 * The rows of the link table: each wanted channel with its link (frame · signal, the conversion,
 * the signal's scaling composed with it, confidence and reason) or, unlinked, its best candidates.
 * mathjs-free: conversions were made on the server; here they are only shown and composed.
 */
import type { ProfileDraft } from '$lib/api/receivers';
import type { CanMap, Signal } from '$lib/can/map';
import { formatCanId } from '$lib/can/map-json';
import type { Candidate } from '$lib/can/receivers/linking';
import type { Link } from '$lib/can/receivers/link-schema';
import type { WantedChannel } from '$lib/can/receivers/profile';
import {
	composeScaling,
	describeConversion,
	formatFactor,
	type ComposedScaling
} from '$lib/can/receivers/scaling';

export interface LinkDetails {
	reasons: Record<string, string>;
	candidates: Record<string, Candidate[]>;
}

export interface LinkRow {
	wanted: WantedChannel;
	link: Link | null;
	/** "0x5F2" of the linked frame. */
	frameId: string | null;
	signal: Signal | null;
	conversion: string | null;
	scaling: ComposedScaling | null;
	/** "by hand", or the score as a percentage. */
	confidence: string | null;
	reason: string;
	/** Best candidates of an unlinked channel; null when not ranked yet (link automatically ranks them). */
	candidates: Candidate[] | null;
}

const same = (a: string, b: string) => a.toLowerCase() === b.toLowerCase();

export function linkRows(draft: ProfileDraft, map: CanMap | null, details: LinkDetails): LinkRow[] {
	return draft.profile.wanted.map((wanted) => {
		const link = draft.links.find((l) => same(l.wanted, wanted.name)) ?? null;
		const frame = link ? map?.frames.find((f) => f.name === link.frame) : undefined;
		const signal = link ? (frame?.signals.find((s) => s.name === link.signal) ?? null) : null;
		return {
			wanted,
			link,
			frameId: link ? formatCanId(link.id, link.extended) : null,
			signal,
			conversion: link ? describeConversion(link.conversion) : null,
			scaling: link && signal ? composeScaling(signal, link.conversion) : null,
			confidence: link
				? link.manual
					? 'by hand'
					: `${Math.round(link.confidence * 100)} %`
				: null,
			reason: details.reasons[wanted.name] ?? (link ? '' : 'not linked'),
			candidates: link ? [] : (details.candidates[wanted.name] ?? null)
		};
	});
}

/** "value = raw × 0.001 + 0", or the reciprocal form a device must divide for. */
export function scalingText(scaling: ComposedScaling): string {
	const body = `raw × ${formatFactor(scaling.scale)} ${scaling.offset < 0 ? '−' : '+'} ${formatFactor(Math.abs(scaling.offset))}`;
	return scaling.form === 'linear' ? `value = ${body}` : `value = 1 / (${body})`;
}
