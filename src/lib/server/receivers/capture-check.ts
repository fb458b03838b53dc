/**
 * A profile (its draft or a revision) on a processed capture: the capture decoded with the map
 * revision the profile's links point at, then the installer's checklist per wanted channel and the
 * device's own alert rules replayed in its units. Reads only: nothing is stored or audited.
 */
import type { RevisionRef } from '../../api/maps';
import type { CheckResponse } from '../../api/receivers';
import { UnknownRuleError, type AlertReplay } from '../../can/alerts/replay';
import type { CaptureDecoding } from '../../can/capture/decode-capture';
import type { CanMap } from '../../can/map';
import { checkOnCapture } from '../../can/receivers/check';
import { replayDeviceAlerts } from '../../can/receivers/device-alerts';
import { decodeWithRevision } from '../captures/decoding';
import type { CaptureRow } from '../db/schema';
import { Problem } from '../problem';
import type { Services } from '../services';
import { loadProfileSnapshot, type ProfileSnapshot } from './revisions';

interface Checked {
	snapshot: ProfileSnapshot;
	capture: CaptureRow;
	mapId: string;
	revision: number;
	map: CanMap;
	result: CaptureDecoding;
}

async function decodeForProfile(
	services: Services,
	workspaceId: string,
	profileId: string,
	input: { capture: string; rev: RevisionRef }
): Promise<Checked> {
	const snapshot = await loadProfileSnapshot(services.db, workspaceId, profileId, input.rev);
	const target = snapshot.draft.target;
	if (!target)
		throw new Problem(
			409,
			snapshot.mapDeleted
				? `The map ${snapshot.label} of this profile was linked to has been deleted; link the profile to another map first.`
				: `The ${snapshot.label} of this profile is not linked to a map revision; link it first, then check it on a capture.`
		);
	const { capture, map, result } = await decodeWithRevision(
		services,
		workspaceId,
		input.capture,
		target.mapId,
		target.revision
	);
	return { snapshot, capture, mapId: target.mapId, revision: target.revision, map, result };
}

/** The installer's checklist: each wanted channel on the capture, in sentences. */
export async function checkProfileOnCapture(
	services: Services,
	workspaceId: string,
	profileId: string,
	input: { capture: string; rev: RevisionRef }
): Promise<CheckResponse> {
	const c = await decodeForProfile(services, workspaceId, profileId, input);
	const { profile, links } = c.snapshot.draft;
	return {
		capture: { id: c.capture.id, name: c.capture.name },
		map: { id: c.mapId, name: c.map.name, revision: c.revision },
		profile: c.snapshot.label,
		check: checkOnCapture(profile, c.map, links, c.result.channels)
	};
}

/** The device alert rules replayed over the capture in the units the device shows. */
export async function replayProfileAlerts(
	services: Services,
	workspaceId: string,
	profileId: string,
	input: {
		capture: string;
		rev: RevisionRef;
		acknowledgements: { ruleId: string; time: number }[];
	}
): Promise<AlertReplay> {
	const c = await decodeForProfile(services, workspaceId, profileId, input);
	const { profile, links } = c.snapshot.draft;
	try {
		return replayDeviceAlerts(
			profile,
			links,
			c.result.channels,
			c.result.duration,
			input.acknowledgements
		);
	} catch (error) {
		if (error instanceof UnknownRuleError)
			throw new Problem(400, 'An acknowledgement names a rule this profile does not have.', [
				{ path: `acknowledgements.${error.index}.ruleId`, message: error.message }
			]);
		throw error;
	}
}
