// The API reference page's model of the generated OpenAPI document: every operation of the
// endpoint list appears once, in its group, with its answer first and failures after, and the type
// labels read the JSON Schema keywords (draft 2020-12) as written.
import { describe, expect, it } from 'vitest';
import { endpoints } from '$lib/api/endpoints';
import { openApiDocument } from '$lib/api/openapi';
import { referenceModel, typeLabel } from './reference-model';

describe('referenceModel', () => {
	it('shows each endpoint once, grouped, with its path parameters and its failures', () => {
		const { groups, schemas } = referenceModel(openApiDocument());
		const shown = groups.flatMap((g) => g.operations);
		expect(shown.map((o) => `${o.method} ${o.path}`).sort()).toEqual(
			Object.values(endpoints)
				.map((e) => `${e.method} ${e.path}`)
				.sort()
		);
		const draft = shown.find((o) => o.id === 'maps.saveDraft')!;
		expect(groups.find((g) => g.operations.includes(draft))?.name).toBe('Maps');
		expect(draft.parameters.map((p) => p.name)).toEqual(['ws', 'mapId']);
		expect(draft.success.status).toBe('200');
		expect(draft.failures.map((f) => f.status)).toEqual(['400', '401', '403', '404', '409', '413']);
		expect(draft.body?.types).toEqual(['application/json']);
		const upload = shown.find((o) => o.id === 'captures.upload')!;
		expect(upload.body?.types).toContain('application/octet-stream');
		expect(schemas.map(([name]) => name)).toContain('LintProblem');
	});

	it('labels types from their keywords', () => {
		expect(typeLabel({ type: 'integer', minimum: 1, maximum: 9007199254740991 })).toBe(
			'integer ≥ 1'
		);
		expect(typeLabel({ type: 'array', items: { $ref: '#/components/schemas/Problem' } })).toBe(
			'array of Problem'
		);
		expect(typeLabel({ anyOf: [{ type: 'string' }, { type: 'null' }] })).toBe('string or null');
		expect(typeLabel({ enum: ['json', 'csv'] })).toBe('"json" | "csv"');
		expect(typeLabel({ type: 'string', const: 'framewright-map@1' })).toBe('"framewright-map@1"');
	});
});
