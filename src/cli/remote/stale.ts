/** The 409 of a draft changed by someone else, explained: who changed it, when, and what to do. */
import { ApiError } from '../../lib/api/client';
import { staleDraftProblemSchema } from '../../lib/api/maps';
import { InputError } from '../errors';

export function explainStaleDraft(
	error: unknown,
	context: { mapName: string; version: number; retry: (current: number) => string }
): InputError | null {
	if (!(error instanceof ApiError) || error.status !== 409) return null;
	const body = staleDraftProblemSchema.safeParse(error.body);
	if (!body.success) return null;
	const { currentVersion, updatedAt, updatedBy } = body.data;
	const who = updatedBy
		? updatedBy.name
			? `${updatedBy.name} <${updatedBy.email}>`
			: updatedBy.email
		: 'someone no longer in the workspace';
	return new InputError(
		`the draft of "${context.mapName}" changed after version ${context.version}: it is at version ${currentVersion}, saved by ${who} at ${updatedAt}. Nothing was changed. ${context.retry(currentVersion)} [HTTP 409]`
	);
}
