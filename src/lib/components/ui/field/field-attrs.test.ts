import { describe, expect, it } from 'vitest';
import { controlAttributes, errorList, optionsFrom, splitFieldProps } from './field-attrs';

describe('errorList', () => {
	it('takes a form action’s list, a single message, or nothing', () => {
		expect(errorList(['Too long', 'Not an address'])).toEqual(['Too long', 'Not an address']);
		expect(errorList('Required')).toEqual(['Required']);
		expect(errorList(undefined)).toEqual([]);
		expect(errorList(null)).toEqual([]);
		expect(errorList(['', '  '])).toEqual([]);
	});
});

describe('controlAttributes', () => {
	it('describes the control by its hint and its errors, and marks it invalid only with errors', () => {
		expect(controlAttributes('f1', { hint: true, errors: [] })).toEqual({
			id: 'f1',
			'aria-invalid': undefined,
			'aria-describedby': 'f1-hint'
		});
		expect(controlAttributes('f1', { hint: true, errors: ['Required'] })).toEqual({
			id: 'f1',
			'aria-invalid': 'true',
			'aria-describedby': 'f1-hint f1-errors'
		});
	});

	it('puts ids named by the page first and leaves the attribute off when nothing describes it', () => {
		expect(
			controlAttributes('f2', { hint: false, errors: ['x'], describedBy: 'presets' })[
				'aria-describedby'
			]
		).toBe('presets f2-errors');
		expect(
			controlAttributes('f3', { hint: false, errors: [] })['aria-describedby']
		).toBeUndefined();
	});
});

describe('splitFieldProps', () => {
	it('gives the label, hint and errors to the field and every other attribute to the control', () => {
		const { field, control } = splitFieldProps({
			label: 'Map name',
			errors: ['Required'],
			fieldClass: 'flex-1',
			name: 'name',
			maxlength: 200,
			placeholder: 'e.g. Engine controller broadcast'
		});
		expect(field).toEqual({ label: 'Map name', errors: ['Required'], fieldClass: 'flex-1' });
		expect(control).toEqual({
			name: 'name',
			maxlength: 200,
			placeholder: 'e.g. Engine controller broadcast'
		});
	});
});

describe('optionsFrom', () => {
	it('keeps the order the labels are written in', () => {
		expect(optionsFrom({ s: 'seconds', ms: 'milliseconds' })).toEqual([
			{ value: 's', label: 'seconds' },
			{ value: 'ms', label: 'milliseconds' }
		]);
	});
});
