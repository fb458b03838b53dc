/**
 * "Define this frame": an unknown ID seen in a capture becomes a frame of the decode's map draft
 * (no signals yet), a normal draft change — versioned, audited, refused when the draft already
 * defines the ID (also through a J1939 frame that matches it by PGN).
 */
import type { DefinedFrameResponse, DefineFrameInput } from '../../api/capture-views';
import { compileMap } from '../../can/decoder';
import { replaceDraft } from '../maps/drafts';
import { requireMap } from '../maps/maps';
import { Problem } from '../problem';
import type { Services } from '../services';
import { requireCaptureRow } from './captures-db';
import { openDecode } from './decoding';
import { undocumentedFrame, undocumentedFrameName } from './undocumented-frame';

export async function defineFrameFromCapture(
	services: Services,
	workspaceId: string,
	captureId: string,
	input: DefineFrameInput,
	actorId: string
): Promise<DefinedFrameResponse> {
	const { db } = services;
	const { decode, stored } = await openDecode(services, workspaceId, captureId, input.decode);
	const label = undocumentedFrameName(input.id, input.extended);
	const seen = stored.summary.ids.find((s) => s.id === input.id && s.extended === input.extended);
	if (!seen) {
		throw new Problem(
			404,
			`ID ${label.replace('Undocumented_', '')} (${input.extended ? 'extended' : 'standard'}) does not occur in this capture.`,
			[{ path: 'id', message: 'not seen in this capture' }]
		);
	}
	const capture = await requireCaptureRow(db, workspaceId, captureId);
	// getDecoded refuses decodes whose map was deleted, so mapId is set here.
	const map = await requireMap(db, workspaceId, decode.mapId!);
	const existing = compileMap(map.draft).lookup(input.id, input.extended);
	if (existing) {
		throw new Problem(
			409,
			`The draft of "${map.name}" already defines this ID as frame "${existing.frame.name}".`,
			undefined,
			{
				frameIndex: existing.frameIndex
			}
		);
	}
	const frame = undocumentedFrame(seen, capture.name);
	const frameIndex = map.draft.frames.length;
	const { version } = await replaceDraft(db, {
		workspaceId,
		mapId: map.id,
		version: map.version,
		draft: { ...map.draft, frames: [...map.draft.frames, frame] },
		actorId,
		action: 'map.frame.define',
		details: {
			frame: frame.name,
			id: input.id,
			extended: input.extended,
			capture: capture.id,
			decode: decode.id
		}
	});
	return { mapId: map.id, version, frameIndex };
}
