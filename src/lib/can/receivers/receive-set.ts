/**
 * The receive set (`framewright-receive@1`): what a receiving device's setup needs per wanted
 * channel — where the bits are and the signal's scale/offset already composed with the link's unit
 * conversion, so the device computes its own value straight from the raw field.
 */
import { z } from 'zod';
import { multiplexerIndex } from '../codec';
import type { CanMap } from '../map';
import { formatCanId, formatJsonPath } from '../map-json';
import { composeScaling, describeConversion, type ComposedScaling } from './conversion';
import { channelText, findMapSignal, type Link } from './linking';
import { findWanted, type ReceiverProfile } from './profile';
import {
	RECEIVE_FORMAT,
	receiveChannelSchema,
	receiveSetSchema,
	type ReceiveChannel,
	type ReceiveSet
} from './receive-set-schema';

export {
	RECEIVE_FORMAT,
	receiveChannelSchema,
	receiveSetSchema,
	type ReceiveChannel,
	type ReceiveSet
};

export interface ReceiveSetProblem {
	wanted: string;
	/** Where in the list of links, e.g. `[2].signal`. */
	path: string;
	message: string;
}

export type BuildReceiveSetResult =
	{ ok: true; receiveSet: ReceiveSet } | { ok: false; problems: ReceiveSetProblem[] };

/**
 * The receive set of a profile linked to a map. Every link must still hold: its wanted channel in
 * the profile, its signal in the map, its conversion starting from the signal's current unit.
 */
export function buildReceiveSet(
	profile: ReceiverProfile,
	map: CanMap,
	links: readonly Link[],
	options: { revision?: number | null } = {}
): BuildReceiveSetResult {
	const problems: ReceiveSetProblem[] = [];
	const byWanted = new Map<string, ReceiveChannel>();
	links.forEach((link, i) => {
		const problem = (field: string, message: string) =>
			problems.push({ wanted: link.wanted, path: formatJsonPath([i, field]), message });
		const wanted = findWanted(profile, link.wanted);
		if (!wanted)
			return problem(
				'wanted',
				`"${link.wanted}" is not a wanted channel of profile "${profile.name}"`
			);
		const found = findMapSignal(map, link);
		if (!found)
			return problem(
				'signal',
				`map "${map.name}" no longer has ${channelText(link.frame, link.signal)} (ID ${formatCanId(link.id, link.extended)}); relink "${wanted.name}"`
			);
		if (found.signal.unit.trim() !== link.conversion.from)
			return problem(
				'conversion',
				`the link of "${wanted.name}" converts from "${link.conversion.from}" but ${channelText(found.frame.name, found.signal.name)} is now in "${found.signal.unit}"; relink it`
			);
		if (link.conversion.to !== wanted.unit)
			return problem(
				'conversion',
				`the link of "${wanted.name}" converts to "${link.conversion.to}" but the channel now shows "${wanted.unit}"; relink it`
			);
		const scaling: ComposedScaling = composeScaling(found.signal, link.conversion);
		const muxAt = multiplexerIndex(found.frame);
		const mux = found.signal.muxValue !== null && muxAt >= 0 ? found.frame.signals[muxAt] : null;
		byWanted.set(wanted.name, {
			name: wanted.name,
			quantity: wanted.quantity,
			frame: found.frame.name,
			id: found.frame.id,
			extended: found.frame.extended,
			j1939: found.frame.j1939,
			signal: found.signal.name,
			startBit: found.signal.startBit,
			length: found.signal.length,
			byteOrder: found.signal.byteOrder,
			valueType: found.signal.valueType,
			multiplexer: mux
				? {
						startBit: mux.startBit,
						length: mux.length,
						byteOrder: mux.byteOrder,
						value: found.signal.muxValue!
					}
				: null,
			...scaling,
			unit: wanted.unit,
			min: wanted.min,
			max: wanted.max,
			decimals: wanted.decimals,
			cycleMs: found.frame.cycleMs,
			conversion: describeConversion(link.conversion)
		});
	});
	if (problems.length) return { ok: false, problems };
	return {
		ok: true,
		receiveSet: {
			format: RECEIVE_FORMAT,
			profile: profile.name,
			kind: profile.kind,
			map: map.name,
			revision: options.revision ?? null,
			bitrate: map.bitrate,
			channels: profile.wanted.flatMap((w) =>
				byWanted.has(w.name) ? [byWanted.get(w.name)!] : []
			),
			unlinked: profile.wanted
				.filter((w) => !byWanted.has(w.name))
				.map((w) => ({ name: w.name, required: w.required }))
		}
	};
}

/** Pretty JSON with IDs as hex strings, like a map file. */
export function serializeReceiveSet(set: ReceiveSet): string {
	const document = {
		...set,
		channels: set.channels.map((c) => ({ ...c, id: formatCanId(c.id, c.extended) }))
	};
	return `${JSON.stringify(document, null, 2)}\n`;
}

/** JSON Schema (draft 2020-12) of the receive set file. */
export function receiveSetJsonSchema(): Record<string, unknown> {
	return {
		...z.toJSONSchema(receiveSetSchema, { io: 'input' }),
		$id: 'https://framewright.invalid/schema/framewright-receive.schema.json',
		title: 'Framewright receive set',
		description:
			'A receive set (format framewright-receive@1): per wanted channel of a receiver profile, the frame and bit field to read and the scale and offset already composed with the unit conversion. Bit numbering: payload bit b is bit b % 8 of byte floor(b / 8); startBit is the least significant bit.'
	};
}
