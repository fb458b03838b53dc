import type { Snippet } from 'svelte';

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

/** Choices from a record of value → label, in the record's order. */
export function optionsFrom(labels: Record<string, string>): { value: string; label: string }[] {
	return Object.entries(labels).map(([value, label]) => ({ value, label }));
}

/** What a labelled control (Input, Select, Textarea, Checkbox) passes on to its Field. */
export interface FieldOptions {
	label: string;
	hint?: string | Snippet;
	errors?: FieldErrors;
	hideLabel?: boolean;
	describedBy?: string;
	/** Classes of the field's box (label, control, hint, errors); `class` styles the control. */
	fieldClass?: string;
	layout?: 'stack' | 'check' | 'inline';
	after?: Snippet;
	id?: string | null;
}

const FIELD_KEYS = [
	'label',
	'hint',
	'errors',
	'hideLabel',
	'describedBy',
	'fieldClass',
	'layout',
	'after',
	'id'
] as const satisfies readonly (keyof FieldOptions)[];

/** Splits a control's props into the Field's and the control element's own attributes. */
export function splitFieldProps<P extends FieldOptions>(
	props: P
): { field: FieldOptions; control: Omit<P, keyof FieldOptions> } {
	const field: Record<string, unknown> = {};
	const control: Record<string, unknown> = {};
	for (const [key, value] of Object.entries(props))
		((FIELD_KEYS as readonly string[]).includes(key) ? field : control)[key] = value;
	return {
		field: field as unknown as FieldOptions,
		control: control as Omit<P, keyof FieldOptions>
	};
}
