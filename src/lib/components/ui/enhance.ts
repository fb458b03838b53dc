import type { SubmitFunction } from '@sveltejs/kit';

/**
 * For `use:enhance`: flags the form busy while its action runs (to disable the button and say
 * "Sending…"), then lets SvelteKit apply the result as usual (`form` prop, redirects, errors).
 */
export function whileSubmitting(setBusy: (busy: boolean) => void): SubmitFunction {
	return () => {
		setBusy(true);
		return async ({ update }) => {
			await update();
			setBusy(false);
		};
	};
}
