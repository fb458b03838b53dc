/**
 * Form fields: a label, the control, a hint and the errors, tied together with `aria-describedby`
 * and `aria-invalid`. The same parts serve a `<form method="POST">` whose action answers
 * `fail(400, { errors })` (pass `errors={form?.errors?.name}`) and a page that checks on its own.
 */
export { default as Field } from './Field.svelte';
export { default as Input } from './Input.svelte';
export { default as Select } from './Select.svelte';
export { default as Textarea } from './Textarea.svelte';
export { default as Checkbox } from './Checkbox.svelte';
export { errorList, optionsFrom, type FieldErrors, type SelectOption } from './field-attrs';
