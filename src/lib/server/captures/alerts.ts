/**
 * The alert rules of the map revision (or draft version) a decode used, replayed over its channels
 * with the acknowledgements given. Nothing is stored, so viewers may replay freely.
 */
import {
	replayAlertRules,
	UnknownRuleError,
	type AlertReplay,
	type AlertReplayInput
} from '../../can/alerts/replay';
import { Problem } from '../problem';
import type { Services } from '../services';
import { getDecoded } from './decoding';

export async function replayDecodeAlerts(
	services: Services,
	workspaceId: string,
	captureId: string,
	input: Required<Pick<AlertReplayInput, 'decode' | 'acknowledgements'>>
): Promise<AlertReplay> {
	const { map, result } = await getDecoded(services, workspaceId, captureId, input.decode);
	try {
		return replayAlertRules(map, result.channels, result.duration, input.acknowledgements);
	} catch (error) {
		if (error instanceof UnknownRuleError) {
			throw new Problem(400, "An acknowledgement names a rule this decode's map does not have.", [
				{ path: `acknowledgements.${error.index}.ruleId`, message: error.message }
			]);
		}
		throw error;
	}
}
