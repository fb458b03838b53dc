/**
 * The API reference page's reading of the OpenAPI document (src/lib/api/openapi.ts): operations
 * grouped by tag in document order, each with its parameters, body, answer and failures.
 */
import type { OpenApiDocument } from '$lib/api/meta';

export type JsonSchema = Record<string, unknown>;

export interface ParameterView {
	name: string;
	in: string;
	required: boolean;
	description: string;
	schema: JsonSchema;
}

export interface AnswerView {
	status: string;
	description: string;
	/** Media types of the body; empty for none. */
	types: string[];
	schema: JsonSchema | null;
}

export interface OperationView {
	id: string;
	method: string;
	path: string;
	summary: string;
	access: string;
	accessText: string;
	parameters: ParameterView[];
	body: { types: string[]; schema: JsonSchema | null } | null;
	success: AnswerView;
	failures: AnswerView[];
}

export interface GroupView {
	name: string;
	description: string;
	operations: OperationView[];
}

interface RawOperation {
	operationId: string;
	summary: string;
	description: string;
	tags: string[];
	'x-access': string;
	parameters?: ParameterView[];
	requestBody?: { content: Record<string, { schema?: JsonSchema }> };
	responses: Record<
		string,
		{ description: string; content?: Record<string, { schema?: JsonSchema }> }
	>;
}

function answer(status: string, raw: RawOperation['responses'][string]): AnswerView {
	const content = raw.content ?? {};
	const types = Object.keys(content);
	return { status, description: raw.description, types, schema: content[types[0]]?.schema ?? null };
}

/** The anchor of an operation on the page. */
export const operationAnchor = (id: string) => `op-${id.replace(/\W/g, '-')}`;
/** The anchor of a named schema on the page. */
export const schemaAnchor = (name: string) => `schema-${name}`;

export function referenceModel(document: OpenApiDocument): {
	groups: GroupView[];
	schemas: [string, JsonSchema][];
} {
	const tags = (document.tags ?? []) as { name: string; description: string }[];
	const groups = new Map<string, GroupView>(
		tags.map((t) => [t.name, { name: t.name, description: t.description, operations: [] }])
	);
	for (const [path, item] of Object.entries(document.paths)) {
		for (const [method, raw] of Object.entries(item as Record<string, RawOperation>)) {
			const statuses = Object.keys(raw.responses).sort();
			const [ok, ...failures] = [
				...statuses.filter((s) => s.startsWith('2')),
				...statuses.filter((s) => !s.startsWith('2'))
			];
			const bodyContent = raw.requestBody?.content;
			const bodyTypes = bodyContent ? Object.keys(bodyContent) : [];
			const view: OperationView = {
				id: raw.operationId,
				method: method.toUpperCase(),
				path,
				summary: raw.summary,
				access: raw['x-access'],
				accessText: raw.description,
				parameters: raw.parameters ?? [],
				body: bodyContent
					? { types: bodyTypes, schema: bodyContent[bodyTypes[0]]?.schema ?? null }
					: null,
				success: answer(ok, raw.responses[ok]),
				failures: failures.map((s) => answer(s, raw.responses[s]))
			};
			const tag = raw.tags[0];
			if (!groups.has(tag)) groups.set(tag, { name: tag, description: '', operations: [] });
			groups.get(tag)!.operations.push(view);
		}
	}
	const schemas = Object.entries(
		((document.components as { schemas?: Record<string, JsonSchema> }).schemas ?? {}) as Record<
			string,
			JsonSchema
		>
	);
	return { groups: [...groups.values()].filter((g) => g.operations.length > 0), schemas };
}

/** A schema's type in a few words: `string`, `integer ≥ 1`, `array of LintProblem`, `one of …`. */
export function typeLabel(schema: JsonSchema): string {
	const ref = schema.$ref;
	if (typeof ref === 'string') return ref.split('/').at(-1)!;
	if ('const' in schema) return JSON.stringify(schema.const);
	if (Array.isArray(schema.enum)) return schema.enum.map((v) => JSON.stringify(v)).join(' | ');
	const union = (schema.anyOf ?? schema.oneOf) as JsonSchema[] | undefined;
	if (union) return union.map(typeLabel).join(' or ');
	const type = schema.type;
	if (Array.isArray(type)) return type.join(' or ');
	if (type === 'array')
		return `array of ${schema.items ? typeLabel(schema.items as JsonSchema) : 'anything'}`;
	if (type === 'object' && !schema.properties && schema.additionalProperties)
		return `map of ${typeLabel(schema.additionalProperties as JsonSchema)}`;
	if (typeof type === 'string') {
		const limits: string[] = [];
		if (typeof schema.minimum === 'number' && Math.abs(schema.minimum) < 1e15)
			limits.push(`≥ ${schema.minimum}`);
		if (typeof schema.maximum === 'number' && Math.abs(schema.maximum) < 1e15)
			limits.push(`≤ ${schema.maximum}`);
		if (typeof schema.maxLength === 'number') limits.push(`≤ ${schema.maxLength} chars`);
		if (typeof schema.pattern === 'string') limits.push(`matching ${schema.pattern}`);
		if (typeof schema.format === 'string') limits.push(`(${schema.format})`);
		return [type, ...limits].join(' ');
	}
	return 'anything';
}
