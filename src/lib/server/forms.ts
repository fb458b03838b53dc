/**
 * Form actions, the way every plain form of the app works with and without JavaScript: the action
 * reads the posted fields, parses them with the same contract schema as the JSON route
 * (`src/lib/api/`), calls the same domain function and answers `{ action, ok, message, … }`. An
 * expected failure (a thrown `Problem`, bad fields included) becomes `fail(status)` with the field
 * errors, the other problems and the sent values, so the form shows them next to its fields.
 */
import { fail, type ActionFailure, type RequestEvent } from '@sveltejs/kit';
import type { z } from 'zod';
import type { FormFailure, FormSuccess } from '../api/forms';
import type { Issue } from '../api/problem';
import { parseOrProblem, Problem } from './problem';

/** Longest text sent back to refill a field (a revision note's limit); longer values are cut. */
export const MAX_ECHOED_CHARS = 2000;
const MAX_ECHOED_FIELDS = 20;
/** A refused import can list thousands of problems; the page shows the first ones. */
export const MAX_FORM_ISSUES = 50;

/**
 * How a field is read: `text` as sent (an absent field as missing), `number` as a number and
 * `optional` as text that is missing when left empty (an empty number is missing too, so the
 * schema's own "required" message is shown rather than one about zero).
 */
export type FieldKind = 'text' | 'number' | 'optional';

/** The named fields of a posted form, as the contract schema expects them. */
export function formFields(
	form: FormData,
	fields: Record<string, FieldKind>
): Record<string, string | number | undefined> {
	const out: Record<string, string | number | undefined> = {};
	for (const [name, kind] of Object.entries(fields)) {
		const raw = form.get(name);
		const text = typeof raw === 'string' ? raw : undefined;
		if (kind === 'text') out[name] = text;
		else if (text === undefined || text.trim() === '') out[name] = undefined;
		else out[name] = kind === 'number' ? Number(text) : text;
	}
	return out;
}

/** The fields parsed by the schema; a 400 naming each refused field otherwise. */
export function readForm<S extends z.ZodType>(
	form: FormData,
	schema: S,
	fields: Record<string, FieldKind>
): z.output<S> {
	return parseOrProblem(schema, formFields(form, fields), 'Some fields need another look.');
}

/** The text fields of a form, each cut to a safe length, to fill the form in again. */
export function echoValues(form: FormData): Record<string, string> {
	const values: Record<string, string> = {};
	let count = 0;
	for (const [name, value] of form) {
		if (typeof value !== 'string' || name in values) continue;
		if (++count > MAX_ECHOED_FIELDS) break;
		values[name] = value.slice(0, MAX_ECHOED_CHARS);
	}
	return values;
}

/** Messages by field (an issue's path), for the issues `belongs` accepts; the rest are returned apart. */
export function fieldErrors(
	issues: readonly Issue[],
	belongs: (path: string) => boolean = () => true
): { errors: Record<string, string[]>; rest: Issue[] } {
	const errors: Record<string, string[]> = {};
	const rest: Issue[] = [];
	for (const issue of issues) {
		if (belongs(issue.path)) (errors[issue.path] ??= []).push(issue.message);
		else rest.push(issue);
	}
	return { errors, rest };
}

/** A refusal as the form shows it: issues about a field that was sent go next to that field. */
export function formFailure<A extends string>(
	action: A,
	problem: Problem,
	form: FormData
): FormFailure<A> {
	const sent = new Set(form.keys());
	const { errors, rest } = fieldErrors(problem.issues ?? [], (path) => sent.has(path));
	return {
		action,
		ok: false,
		status: problem.status,
		message: problem.message,
		errors,
		values: echoValues(form),
		issues: rest.slice(0, MAX_FORM_ISSUES)
	};
}

/**
 * Wraps a form action: `handler` guards, parses (`readForm`), calls one domain function and returns
 * what to show; a thrown `Problem` becomes `fail(status, FormFailure)`. Redirects and the guard's
 * errors pass through untouched.
 */
export function formAction<A extends string, E extends RequestEvent, T extends { message: string }>(
	action: A,
	handler: (event: E, form: FormData) => Promise<T>
): (event: E) => Promise<(FormSuccess<A> & T) | ActionFailure<FormFailure<A>>> {
	return async (event) => {
		const form = await event.request.formData();
		try {
			const answer = await handler(event, form);
			return { ...answer, action, ok: true as const };
		} catch (thrown) {
			if (thrown instanceof Problem) return fail(thrown.status, formFailure(action, thrown, form));
			throw thrown;
		}
	};
}
