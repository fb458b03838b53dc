/**
 * What ties a form control to its label, hint and errors, so screen readers read them with it:
 * `aria-describedby` lists the hint and error ids, `aria-invalid` marks a refused value.
 */
export type FieldErrors = string | readonly string[] | null | undefined;

/** Errors as a list, whether a form action sent `fail(400, { errors })` lists or the page a message. */
export function errorList(errors: FieldErrors): string[] {
	if (!errors) return [];
	return (typeof errors === 'string' ? [errors] : [...errors]).filter((e) => e.trim() !== '');
}

export interface ControlAttributes {
	id: string;
	'aria-invalid': 'true' | undefined;
	'aria-describedby': string | undefined;
}

export function controlAttributes(
	id: string,
	options: { hint: boolean; errors: readonly string[]; describedBy?: string }
): ControlAttributes {
	const ids = [
		options.describedBy,
		options.hint ? `${id}-hint` : null,
		options.errors.length ? `${id}-errors` : null
	].filter(Boolean);
	return {
		id,
		'aria-invalid': options.errors.length ? 'true' : undefined,
		'aria-describedby': ids.length ? ids.join(' ') : undefined
	};
}

export interface SelectOption {
	value: string | number;
	label: string;
	disabled?: boolean;
}
