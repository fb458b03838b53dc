import type { ActionResult, SubmitFunction } from '@sveltejs/kit';

/* eslint-disable @typescript-eslint/no-explicit-any -- SvelteKit's own defaults for action data */
type ActionData = Record<string, any> | undefined;
/* eslint-enable @typescript-eslint/no-explicit-any */

export interface SubmitOptions<Success extends ActionData, Failure extends ActionData> {
	/** Clear the form after a success (SvelteKit's default); off for forms showing stored values. */
	reset?: boolean;
	/** Sees the result before the page reloads its data (e.g. to mirror a change into local state). */
	onresult?: (result: ActionResult<Success, Failure>) => void;
}

/**
 * For `use:enhance`: flags the form busy while its action runs (to disable the button and say
 * "Sending…"), then lets SvelteKit apply the result as usual (`form` prop, reloaded data,
 * redirects, errors).
 */
export function whileSubmitting<
	Success extends ActionData = ActionData,
	Failure extends ActionData = ActionData
>(
	setBusy: (busy: boolean) => void,
	options: SubmitOptions<Success, Failure> = {}
): SubmitFunction<Success, Failure> {
	return () => {
		setBusy(true);
		return async ({ result, update }) => {
			options.onresult?.(result);
			await update({ reset: options.reset ?? true });
			setBusy(false);
		};
	};
}
