/**
 * The alert rules of the map revision (or draft version) a decode used, replayed over its channels
 * with the acknowledgements given, in a capture worker (work/alerts.ts). Nothing is stored, so
 * viewers may replay freely.
 */
import {
	replayAlertRules,
	UnknownRuleError,
	type AlertReplay,
	type AlertReplayInput
} from '../../can/alerts/replay';
import { Problem } from '../problem';
import type { Services } from '../services';
import { openDecode } from './decoding';
import { runCaptureTask } from './pool';

export async function replayDecodeAlerts(
	services: Services,
	workspaceId: string,
	captureId: string,
	input: Required<Pick<AlertReplayInput, 'decode' | 'acknowledgements'>>
): Promise<AlertReplay> {
	const open = await openDecode(services, workspaceId, captureId, input.decode);
	try {
		// Checks the acknowledgements against the rules here (no channel needed), for a 400 with the path.
		replayAlertRules(open.map, [], 0, input.acknowledgements);
	} catch (error) {
		if (error instanceof UnknownRuleError) {
			throw new Problem(400, "An acknowledgement names a rule this decode's map does not have.", [
				{ path: `acknowledgements.${error.index}.ruleId`, message: error.message }
			]);
		}
		throw error;
	}
	return runCaptureTask<AlertReplay>({
		kind: 'alerts',
		storage: services.storage.settings,
		indexKey: open.indexKey,
		map: open.map,
		folder: open.folder,
		duration: open.stored.summary.durationS,
		acknowledgements: input.acknowledgements
	});
}
