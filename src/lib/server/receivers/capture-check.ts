/**
 * A profile (its draft or a revision) on a processed capture: the capture decoded with the map
 * revision the profile's links point at, then the installer's checklist per wanted channel and the
 * device's own alert rules replayed in its units. Reads only: nothing is stored or audited.
 */
import type { RevisionRef } from '../../api/maps';
import type { CheckResponse } from '../../api/receivers';
import { UnknownRuleError, type AlertReplay } from '../../can/alerts/replay';
import type { CaptureCheck } from '../../can/receivers/check';
import { replayDeviceAlerts } from '../../can/receivers/device-alerts';
import { openRevisionDecode, type OpenDecode } from '../captures/decoding';
import { runCaptureTask } from '../captures/pool';
import type { ReceiverTask } from '../captures/work/tasks';
import { Problem } from '../problem';
import type { Services } from '../services';
import { loadProfileSnapshot, type ProfileSnapshot } from './revisions';

interface Checked {
	snapshot: ProfileSnapshot;
	mapId: string;
	revision: number;
	open: Omit<OpenDecode, 'decode'>;
}

/** The profile's work on the capture, in a capture worker (captures/work/receivers.ts). */
function runOnCapture<T>(
	services: Services,
	c: Checked,
	what: ReceiverTask['what'],
	acknowledgements: ReceiverTask['acknowledgements'] = []
): Promise<T> {
	const { profile, links } = c.snapshot.draft;
	return runCaptureTask<T>({
		kind: 'receiver',
		what,
		storage: services.storage.settings,
		indexKey: c.open.indexKey,
		map: c.open.map,
		folder: c.open.folder,
		profile,
		links,
		duration: c.open.stored.summary.durationS,
		acknowledgements
	} satisfies ReceiverTask);
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
	const open = await openRevisionDecode(
		services,
		workspaceId,
		input.capture,
		target.mapId,
		target.revision
	);
	return { snapshot, mapId: target.mapId, revision: target.revision, open };
}

/** The installer's checklist: each wanted channel on the capture, in sentences. */
export async function checkProfileOnCapture(
	services: Services,
	workspaceId: string,
	profileId: string,
	input: { capture: string; rev: RevisionRef }
): Promise<CheckResponse> {
	const c = await decodeForProfile(services, workspaceId, profileId, input);
	return {
		capture: { id: c.open.capture.id, name: c.open.capture.name },
		map: { id: c.mapId, name: c.open.map.name, revision: c.revision },
		profile: c.snapshot.label,
		check: await runOnCapture<CaptureCheck>(services, c, 'check')
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
		// Checks the acknowledgements against the rules here (no channel needed), for a 400 with the path.
		replayDeviceAlerts(profile, links, [], 0, input.acknowledgements);
	} catch (error) {
		if (error instanceof UnknownRuleError)
			throw new Problem(400, 'An acknowledgement names a rule this profile does not have.', [
				{ path: `acknowledgements.${error.index}.ruleId`, message: error.message }
			]);
		throw error;
	}
	return runOnCapture<AlertReplay>(services, c, 'alerts', input.acknowledgements);
}
