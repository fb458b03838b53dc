import { describe, expect, it } from 'vitest';
import { renameInputSchema } from '../api/maps';
import {
	echoValues,
	formAction,
	formFailure,
	formFields,
	MAX_ECHOED_CHARS,
	readForm
} from './forms';
import { Problem } from './problem';

const formOf = (entries: Record<string, string>) => {
	const form = new FormData();
	for (const [k, v] of Object.entries(entries)) form.append(k, v);
	return form;
};

describe('formFields', () => {
	it('reads text as sent, numbers as numbers, and empty numbers or optional text as missing', () => {
		const form = formOf({ name: ' Bench ', version: '3', note: '', expiresAt: '' });
		expect(
			formFields(form, { name: 'text', version: 'number', expiresAt: 'optional', absent: 'text' })
		).toEqual({ name: ' Bench ', version: 3, expiresAt: undefined, absent: undefined });
		expect(formFields(formOf({ version: '' }), { version: 'number' })).toEqual({
			version: undefined
		});
		expect(formFields(formOf({ version: 'x' }), { version: 'number' }).version).toBeNaN();
	});
});

describe('readForm', () => {
	it('parses with the contract schema and names each refused field', () => {
		expect(
			readForm(formOf({ name: '  Gearbox  ', version: '4' }), renameInputSchema, {
				name: 'text',
				version: 'number'
			})
		).toEqual({ name: 'Gearbox', version: 4 });
		try {
			readForm(formOf({ name: '   ', version: 'two' }), renameInputSchema, {
				name: 'text',
				version: 'number'
			});
			expect.unreachable();
		} catch (thrown) {
			expect(thrown).toBeInstanceOf(Problem);
			const problem = thrown as Problem;
			expect(problem.status).toBe(400);
			expect(problem.issues?.map((i) => i.path).sort()).toEqual(['name', 'version']);
		}
	});
});

describe('echoValues', () => {
	it('returns text fields cut to a safe length, never files', () => {
		const form = formOf({ note: 'x'.repeat(MAX_ECHOED_CHARS + 500), role: 'editor' });
		form.append('file', new File(['secret'], 'map.json'));
		const values = echoValues(form);
		expect(values.note).toHaveLength(MAX_ECHOED_CHARS);
		expect(values.role).toBe('editor');
		expect(values).not.toHaveProperty('file');
	});
});

describe('formFailure', () => {
	it('puts issues about sent fields next to them and keeps the rest as a list', () => {
		const problem = new Problem(422, 'The draft has 1 lint error.', [
			{ path: 'note', message: 'Too long' },
			{ path: 'frames.0.signals.1', message: 'Runs past the payload' }
		]);
		expect(formFailure('publish', problem, formOf({ note: 'n', version: '2' }))).toEqual({
			action: 'publish',
			ok: false,
			status: 422,
			message: 'The draft has 1 lint error.',
			errors: { note: ['Too long'] },
			values: { note: 'n', version: '2' },
			issues: [{ path: 'frames.0.signals.1', message: 'Runs past the payload' }]
		});
	});
});

describe('formAction', () => {
	const eventWith = (form: FormData) =>
		({ request: new Request('http://localhost/x', { method: 'POST', body: form }) }) as never;

	it('answers the handler’s result with the action’s name', async () => {
		const action = formAction('rename', async (_event, form) => ({
			message: `Renamed to ${form.get('name')}.`
		}));
		expect(await action(eventWith(formOf({ name: 'B' })))).toEqual({
			action: 'rename',
			ok: true,
			message: 'Renamed to B.'
		});
	});

	it('turns a Problem into fail(status) and lets anything else through', async () => {
		const refused = formAction('publish', async () => {
			throw new Problem(409, 'Someone else changed this map.');
		});
		const answer = (await refused(eventWith(formOf({ note: 'hello' })))) as {
			status: number;
			data: unknown;
		};
		expect(answer.status).toBe(409);
		expect(answer.data).toMatchObject({
			action: 'publish',
			ok: false,
			message: 'Someone else changed this map.',
			values: { note: 'hello' }
		});
		const broken = formAction('publish', async () => {
			throw new TypeError('bug');
		});
		await expect(broken(eventWith(formOf({})))).rejects.toThrow('bug');
	});
});
