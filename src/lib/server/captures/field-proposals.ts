/**
 * Field proposals on the capture page (docs/field-proposals.md, "On the capture page"): proposals
 * for the IDs a decode's map does not define, a decoded channel against their candidate value
 * fields, and accepting chosen proposals as signals of a new frame in a map's draft. The work runs
 * in the capture worker pool (work/fields.ts); answers are kept in bounded in-memory caches, keyed
 * by the capture's store (proposals depend on nothing else), so opening an ID again is instant.
 */
import type {
	AcceptedFieldsResponse,
	AcceptFieldsInput,
	CorrelateQuery,
	CorrelateResponse,
	FieldsQuery,
	FieldsResponse
} from '../../api/field-proposals';
import { MAX_RANKING } from '../../api/field-proposals';
import { compileMap } from '../../can/decoder';
import { candidatesFromProposals, type IdProposals } from '../../can/fields';
import { lintMap } from '../../can/lint';
import { mapDrafts, replaceDraft } from '../maps/drafts';
import { requireMap } from '../maps/maps';
import { Problem } from '../problem';
import type { Services } from '../services';
import { staleDraft } from '../versioning/drafts';
import { findDecode } from './captures-db';
import { correlations, proposals } from './field-proposal-cache';
import { captureIndexKey, openDecode, requireReadyCapture } from './decoding';
import { runCaptureTask } from './pool';
import { undocumentedFrame, undocumentedFrameName } from './undocumented-frame';
import { summaryKey } from './work/decode';
import type { CorrelateOutcome, FieldsOutcome, StoredDecode } from './work/tasks';
import type { DecodeRecord } from '../../api/captures';
import type { CaptureRow } from '../db/schema';
import { StorageNotFoundError } from '../storage/storage';
import { decodeFolder } from './capture-store';

const idKey = (id: number, extended: boolean) => `${extended ? 'x' : 's'}${id}`;
const idText = (id: number, extended: boolean) =>
	undocumentedFrameName(id, extended).replace('Undocumented_', '');

/**
 * IDs with at most this many frames in all are proposed in the interactive pool (a thread kept
 * ready, pool.ts): opening one unknown ID is a short answer a person waits for (tens of ms).
 */
const INTERACTIVE_FRAMES = 250_000;

/** Proposals of these IDs: cached ones as they are, the others computed in one worker task. */
async function proposalsOf(
	services: Services,
	indexKey: string,
	ids: { id: number; extended: boolean; count: number }[]
): Promise<IdProposals[]> {
	const missing = ids.filter((i) => !proposals.has(`${indexKey}|${idKey(i.id, i.extended)}`));
	if (missing.length > 0) {
		const frames = missing.reduce((n, i) => n + i.count, 0);
		const computed = await runCaptureTask<FieldsOutcome>(
			{
				kind: 'fields',
				storage: services.storage.settings,
				indexKey,
				ids: missing.map(({ id, extended }) => ({ id, extended }))
			},
			{ interactive: frames <= INTERACTIVE_FRAMES }
		);
		for (const p of computed) proposals.set(`${indexKey}|${idKey(p.id, p.extended)}`, p);
		// Larger than the cache: answered from this result, not kept.
		if (missing.some((i) => !proposals.has(`${indexKey}|${idKey(i.id, i.extended)}`))) {
			const byKey = new Map(computed.map((p) => [idKey(p.id, p.extended), p]));
			return ids.flatMap((i) => {
				const p =
					proposals.get(`${indexKey}|${idKey(i.id, i.extended)}`) ??
					byKey.get(idKey(i.id, i.extended));
				return p ? [p] : [];
			});
		}
	}
	return ids.flatMap((i) => {
		const p = proposals.get(`${indexKey}|${idKey(i.id, i.extended)}`);
		return p ? [p] : [];
	});
}

export async function fieldProposals(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: FieldsQuery
): Promise<FieldsResponse> {
	const open = await openDecode(services, workspaceId, captureId, q.decode);
	let unknown = open.stored.summary.unknownIds;
	if (q.id !== undefined) {
		unknown = unknown.filter(
			(u) => u.id === q.id && (q.extended === undefined || u.extended === q.extended)
		);
		if (unknown.length === 0) {
			throw new Problem(
				404,
				`ID ${q.id.toString(16).toUpperCase()} is not among the IDs this decode's map leaves undefined.`,
				[{ path: 'id', message: 'not an unknown ID of this decode' }]
			);
		}
	}
	const ids = await proposalsOf(services, open.indexKey, unknown);
	const map = await requireMap(services.db, workspaceId, open.decode.mapId!);
	const drafts = await services.db
		.selectFrom('maps')
		.select(['id as mapId', 'name as mapName', 'draft_version as version'])
		.where('workspace_id', '=', workspaceId)
		.orderBy('name')
		.execute();
	return { draft: { mapId: map.id, mapName: map.name, version: map.version }, drafts, ids };
}

export async function correlateChannel(
	services: Services,
	workspaceId: string,
	captureId: string,
	q: CorrelateQuery
): Promise<CorrelateResponse> {
	const open = await openDecode(services, workspaceId, captureId, q.decode);
	const { summary, channels } = open.stored;
	const info = summary.channels.find((c) => c.index === q.channel);
	if (!info || !channels[q.channel]) {
		throw new Problem(
			404,
			`This decode has ${summary.channels.length} channels (0–${summary.channels.length - 1}); there is no channel ${q.channel}.`,
			[{ path: 'channel', message: 'no such channel in this decode' }]
		);
	}
	const cacheKey = `${open.indexKey}|${open.decode.id}|${q.channel}|${q.points}`;
	const hit = correlations.get(cacheKey);
	if (hit) return hit;
	const ids = await proposalsOf(services, open.indexKey, summary.unknownIds);
	const candidates = ids.flatMap((p) => candidatesFromProposals(p, p.fields));
	const outcome =
		candidates.length === 0
			? { ranking: [], scatter: { raw: [], channel: [] } }
			: await runCaptureTask<CorrelateOutcome>({
					kind: 'correlate',
					storage: services.storage.settings,
					indexKey: open.indexKey,
					map: open.map,
					folder: open.folder,
					channel: q.channel,
					candidates,
					maxPoints: q.points,
					top: MAX_RANKING
				});
	const answer: CorrelateResponse = {
		channel: {
			index: info.index,
			frameName: info.frameName,
			signalName: info.signalName,
			unit: info.unit
		},
		candidates: candidates.length,
		ranking: outcome.ranking.map((r) => ({
			id: r.field.id,
			extended: r.field.extended,
			startBit: r.field.startBit,
			length: r.field.length,
			byteOrder: r.field.byteOrder,
			signed: r.field.signed,
			muxValue: r.field.page?.value ?? null,
			samples: r.samples,
			pearson: r.pearson,
			spearman: r.spearman,
			scale: r.scale,
			offset: r.offset,
			residual: r.residual
		})),
		scatter: outcome.scatter
	};
	correlations.set(cacheKey, answer);
	return answer;
}

/**
 * The ID survey of a recorded decode, read from its stored summary: it describes the capture, so
 * it holds even when the draft the decode used has changed since (which openDecode refuses).
 */
async function storedIds(
	services: Services,
	capture: CaptureRow,
	decode: DecodeRecord
): Promise<StoredDecode['summary']['ids']> {
	const gone = new Problem(
		410,
		'This decode is no longer stored; decode the capture again and accept the proposals from there.'
	);
	if (decode.mapId === null) throw gone;
	// The folder the decode was stored under: beside the capture's current store (a capture read
	// again has a new one), per bus for a one-bus decode, as openDecode finds it.
	const folder = decodeFolder(
		await captureIndexKey(services, capture),
		decode.mapId,
		decode.revision,
		decode.draftVersion,
		decode.bus ?? null
	);
	try {
		const bytes = await services.storage.getBytes(summaryKey(folder));
		return (JSON.parse(new TextDecoder().decode(bytes)) as StoredDecode).summary.ids;
	} catch (error) {
		if (error instanceof StorageNotFoundError) throw gone;
		throw error;
	}
}

/**
 * Chosen proposals as signals of a new frame for an unknown ID, appended to a map's draft (the
 * decode's map unless another is named) as one versioned, audited draft change. The draft version
 * the person read is checked first, so a draft changed since answers 409 naming who changed it.
 */
export async function acceptFieldProposals(
	services: Services,
	workspaceId: string,
	captureId: string,
	input: AcceptFieldsInput,
	actorId: string
): Promise<AcceptedFieldsResponse> {
	const { db } = services;
	const capture = await requireReadyCapture(services, workspaceId, captureId);
	const decode = await findDecode(db, capture.id, input.decode);
	if (!decode) throw new Problem(404, 'Decode not found for this capture.');
	const mapId = input.mapId ?? decode.mapId;
	if (mapId === null) {
		throw new Problem(
			410,
			`The map "${decode.mapName}" this decode used has been deleted; name another map to add the frame to.`
		);
	}
	const map = await requireMap(db, workspaceId, mapId);
	if (map.version !== input.version) throw staleDraft(mapDrafts.noun, map);
	const ids = await storedIds(services, capture, decode);
	const seen = ids.find((s) => s.id === input.id && s.extended === input.extended);
	if (!seen) {
		throw new Problem(
			404,
			`ID ${idText(input.id, input.extended)} (${input.extended ? 'extended' : 'standard'}) does not occur in this capture.`,
			[{ path: 'id', message: 'not seen in this capture' }]
		);
	}
	const existing = compileMap(map.draft).lookup(input.id, input.extended);
	if (existing) {
		throw new Problem(
			409,
			`The draft of "${map.name}" already defines this ID as frame "${existing.frame.name}"; add the signals there in the map editor.`,
			undefined,
			{ frameIndex: existing.frameIndex }
		);
	}
	const base = undocumentedFrame(seen, capture.name);
	const frame = {
		...base,
		name: input.frameName ?? base.name,
		comment: base.comment.replace(
			'Signals still to be defined.',
			`${input.signals.length} signal(s) accepted from field proposals (docs/field-proposals.md).`
		),
		signals: input.signals
	};
	if (map.draft.frames.some((f) => f.name === frame.name)) {
		throw new Problem(
			400,
			`The draft already has a frame named "${frame.name}"; choose another name.`,
			[{ path: 'frameName', message: 'already a frame of this map' }]
		);
	}
	const frameIndex = map.draft.frames.length;
	const draft = { ...map.draft, frames: [...map.draft.frames, frame] };
	const { version } = await replaceDraft(db, {
		workspaceId,
		mapId: map.id,
		version: input.version,
		draft,
		actorId,
		action: 'map.frame.define',
		details: {
			frame: frame.name,
			id: input.id,
			extended: input.extended,
			signals: input.signals.length,
			from: 'field-proposals',
			capture: capture.id,
			decode: decode.id
		}
	});
	return {
		mapId: map.id,
		version,
		frameIndex,
		lint: lintMap(draft).filter((p) => p.frameIndex === frameIndex)
	};
}
