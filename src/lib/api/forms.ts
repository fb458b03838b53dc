/**
 * What a page's form action answers (SvelteKit's `form` prop), shared by the server helper that
 * builds it (`src/lib/server/forms.ts`) and the components that show it. Several forms share a
 * page, so every answer names its action and each form shows only its own.
 */
import type { Issue } from './problem';

/** A refused form: `fail(status, …)`. */
export interface FormFailure<A extends string = string> {
	action: A;
	ok: false;
	/** The HTTP status: 400 bad fields, 403, 404, 409 someone else changed it first, 422 … */
	status: number;
	/** What went wrong, in a sentence for the whole form. */
	message: string;
	/** Messages by field name, shown next to each field. */
	errors: Record<string, string[]>;
	/** What was sent (text fields only, each cut to a safe length), so the form shows it again. */
	values: Record<string, string>;
	/** Problems that belong to no field of the form (e.g. the lint errors refusing a publish). */
	issues: Issue[];
}

/** A form that went through; actions add what the page needs to show (e.g. the undo of a change). */
export interface FormSuccess<A extends string = string> {
	action: A;
	ok: true;
	/** A line for the person: what changed. */
	message: string;
}

/** The answer of `action` when it is the one the page holds, else null. */
export function formFor<F extends { action: string } | null | undefined, A extends string>(
	form: F,
	action: A
): Extract<NonNullable<F>, { action: A }> | null {
	return form?.action === action ? (form as Extract<NonNullable<F>, { action: A }>) : null;
}
