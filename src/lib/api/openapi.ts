/**
 * The API described in OpenAPI 3.1, generated from the endpoint list (`endpoints.ts`) and the zod
 * schemas the routes validate with (zod's own JSON Schema output, draft 2020-12, which is OpenAPI
 * 3.1's schema dialect). Requests are described as they may be sent (`io: 'input'`: defaults make
 * fields optional), answers as they come back (`io: 'output'`). Named schemas (`.meta({ id })`)
 * become components; an input form that differs from its answer form is named `<id>Input`.
 */
import { z } from 'zod';
import type { Access, EndpointDef } from './endpoint';
import { endpoints } from './endpoints';
import type { OpenApiDocument } from './meta';

type Json = Record<string, unknown>;
type Io = 'input' | 'output';

/** Version of the API contract; goes up when a route or shape changes incompatibly. */
export const API_VERSION = '1.0.0';

/** Groups of routes (OpenAPI tags), from the first part of each endpoint's name. */
export const API_GROUPS: Record<string, { name: string; description: string }> = {
	workspaces: { name: 'Workspaces', description: 'A team’s space with members and roles.' },
	members: { name: 'Members', description: 'People in a workspace and their roles.' },
	invitations: { name: 'Invitations', description: 'E-mailed invitations to join a workspace.' },
	maps: {
		name: 'Maps',
		description: 'Broadcast maps: the draft, published revisions, diffs, share links, downloads.'
	},
	share: { name: 'Share links', description: 'What anyone holding a share link may fetch.' },
	captures: {
		name: 'Captures',
		description: 'Uploaded recordings of bus frames: processing, decoding, views and downloads.'
	},
	tools: { name: 'Tools', description: 'Planning computations over a map.' },
	meta: { name: 'This API', description: 'The description of the API itself.' }
};

export const SECURITY_SCHEMES = {
	accessToken: {
		type: 'http',
		scheme: 'bearer',
		bearerFormat: 'fwt_<id>_<secret>',
		description:
			'A personal access token made on a workspace’s Access tokens page: it works in that workspace only, read-only (viewer) or edit (editor), until it expires or is revoked. Pages and forms do not accept it.'
	},
	session: {
		type: 'apiKey',
		in: 'cookie',
		name: 'authjs.session-token',
		description: 'The browser session of a signed-in person (sign-in by e-mailed link).'
	}
} as const;

const PATH_PARAMETERS: Record<string, string> = {
	ws: 'The workspace’s slug (as in its page URLs).',
	mapId: 'The map’s id.',
	n: 'A revision number (1 for r1).',
	id: 'The id of the item the path names before it.',
	userId: 'The member’s user id.',
	decodeId: 'The id of a recorded decode of the capture.',
	index: 'The frame’s position in the capture, from 0.',
	token: 'The share link’s token (the last part of its URL).'
};

const STATUS_WORDS: Record<number, string> = {
	200: 'Done.',
	201: 'Created.',
	202: 'Accepted: the work goes on; poll for its progress.',
	204: 'Done; no content.'
};

/** Who may call, in words (also shown on the API reference page). */
export function accessText(access: Access): string {
	if (access === 'public') return 'Anyone: no sign-in or token needed.';
	if (access === 'signed-in')
		return 'Any signed-in person, or an access token (which sees only its own workspace).';
	const who = `A member with at least the ${access} role, signed in or with an access token`;
	return access === 'owner'
		? `${who} — in practice signed in: tokens are read-only or edit, never owner.`
		: `${who}.`;
}

const PLACEHOLDER = /^#\/components\/schemas\/(.+)@(input|output)$/;

/** Collects named schemas met while converting, in both forms, and names them at the end. */
class Components {
	private readonly found = new Map<string, Partial<Record<Io, Json>>>();

	/** A zod schema as JSON Schema, its named parts left as placeholder references. */
	convert(schema: z.ZodType, io: Io): Json {
		const converted = z.toJSONSchema(schema, {
			io,
			target: 'draft-2020-12',
			unrepresentable: 'any'
		}) as Json;
		const { $defs, $schema, ...rest } = converted;
		void $schema;
		for (const [id, def] of Object.entries(($defs ?? {}) as Record<string, Json>)) {
			const forms = this.found.get(id) ?? {};
			const placed = this.placeholders(def, io);
			const known = forms[io];
			if (known && JSON.stringify(known) !== JSON.stringify(placed))
				throw new Error(`Two different schemas are both named "${id}" (${io})`);
			forms[io] = placed;
			this.found.set(id, forms);
		}
		return this.placeholders(rest, io);
	}

	private placeholders(value: Json, io: Io): Json {
		return mapRefs(value, (ref) =>
			ref.startsWith('#/$defs/') ? `#/components/schemas/${ref.slice(8)}@${io}` : ref
		);
	}

	/** The component name of a schema in one form: `Map`, or `MapInput` when its input form differs. */
	private nameOf(id: string, io: Io): string {
		const forms = this.found.get(id)!;
		if (io === 'output' || !forms.output) return id;
		return JSON.stringify(forms.input) === JSON.stringify(forms.output) ? id : `${id}Input`;
	}

	/** Resolves every placeholder of `value` and returns the components it needs. */
	finish<T extends Json>(value: T): { value: T; schemas: Record<string, Json> } {
		const resolve = (v: Json) =>
			mapRefs(v, (ref) => {
				const match = PLACEHOLDER.exec(ref);
				return match ? `#/components/schemas/${this.nameOf(match[1], match[2] as Io)}` : ref;
			});
		const schemas: Record<string, Json> = {};
		for (const [id, forms] of [...this.found].sort(([a], [b]) => a.localeCompare(b))) {
			for (const io of ['output', 'input'] as const) {
				const form = forms[io];
				if (form) schemas[this.nameOf(id, io)] = resolve(form);
			}
		}
		return { value: resolve(value) as T, schemas };
	}
}

/** A copy of a JSON value with every `$ref` string passed through `change`. */
function mapRefs(value: Json, change: (ref: string) => string): Json {
	const walk = (v: unknown): unknown => {
		if (Array.isArray(v)) return v.map(walk);
		if (v && typeof v === 'object') {
			const out: Json = {};
			for (const [k, inner] of Object.entries(v)) {
				out[k] = k === '$ref' && typeof inner === 'string' ? change(inner) : walk(inner);
			}
			return out;
		}
		return v;
	};
	return walk(value) as Json;
}

/** `{ws}`, `{mapId}` … of a path template. */
export function pathParameterNames(template: string): string[] {
	return [...template.matchAll(/\{(\w+)\}/g)].map((m) => m[1]);
}

function parameters(def: EndpointDef, components: Components): Json[] {
	const out: Json[] = pathParameterNames(def.path).map((name) => ({
		name,
		in: 'path',
		required: true,
		description: PATH_PARAMETERS[name] ?? name,
		schema: { type: 'string' }
	}));
	if (def.query) {
		const query = components.convert(def.query, 'input') as {
			properties?: Record<string, Json>;
			required?: string[];
		};
		for (const [name, schema] of Object.entries(query.properties ?? {})) {
			const { description, ...rest } = schema;
			out.push({
				name,
				in: 'query',
				required: query.required?.includes(name) ?? false,
				...(typeof description === 'string' ? { description } : {}),
				schema: rest
			});
		}
	}
	return out;
}

function requestBody(def: EndpointDef, components: Components): Json | undefined {
	if (!def.body) return undefined;
	if (def.body === 'binary') {
		const file = { schema: { type: 'string', contentMediaType: 'application/octet-stream' } };
		return {
			required: true,
			description: 'The file’s bytes, streamed as the whole body.',
			content: { 'application/octet-stream': file, 'text/csv': file }
		};
	}
	return {
		required: true,
		content: { 'application/json': { schema: components.convert(def.body, 'input') } }
	};
}

function downloadContent(download: string): Json {
	const content: Json = {};
	for (const part of download.split(' or ')) {
		const type = part.split(';')[0].trim();
		content[type] = {
			schema:
				type === 'application/json'
					? { description: 'The file, as JSON.' }
					: { type: 'string', contentMediaType: type }
		};
	}
	return content;
}

function responses(def: EndpointDef, components: Components): Json {
	const out: Json = {};
	const success: Json = { description: STATUS_WORDS[def.status] ?? 'Done.' };
	if (def.response)
		success.content = {
			'application/json': { schema: components.convert(def.response, 'output') }
		};
	else if (def.download) {
		success.description = `The file (${def.download}).`;
		success.content = downloadContent(def.download);
	}
	out[String(def.status)] = success;
	for (const [status, spec] of Object.entries(def.errors)) {
		if (!spec) continue;
		out[status] = {
			description: spec.description,
			content: { 'application/json': { schema: components.convert(spec.body, 'output') } }
		};
	}
	return out;
}

/** The whole document; `serverUrl` (the site's origin) goes into `servers` when given. */
export function openApiDocument(options: { serverUrl?: string } = {}): OpenApiDocument {
	const components = new Components();
	const paths: Record<string, Record<string, Json>> = {};
	const usedGroups = new Set<string>();
	for (const [name, entry] of Object.entries(endpoints)) {
		const def = entry as EndpointDef;
		const group = name.split('.')[0];
		usedGroups.add(group);
		const body = requestBody(def, components);
		const operation: Json = {
			operationId: name,
			summary: def.summary,
			description: accessText(def.access),
			tags: [API_GROUPS[group]?.name ?? group],
			'x-access': def.access,
			parameters: parameters(def, components),
			...(body ? { requestBody: body } : {}),
			responses: responses(def, components),
			security: def.access === 'public' ? [] : [{ accessToken: [] as string[] }, { session: [] }]
		};
		(paths[def.path] ??= {})[def.method.toLowerCase()] = operation;
	}
	const { value, schemas } = components.finish({ paths } as Json);
	return {
		openapi: '3.1.0',
		info: {
			title: 'Framewright API',
			version: API_VERSION,
			summary: 'Maps, revisions, captures and decodes of a Framewright workspace, for scripts.',
			description:
				'Every failure answers `{ error, issues? }` with its HTTP status. Send an access token as `Authorization: Bearer <token>`; it acts as its maker, in its workspace only, at its role. A token used outside its workspace gets the same 404 as a workspace that does not exist.'
		},
		...(options.serverUrl ? { servers: [{ url: options.serverUrl }] } : {}),
		tags: [...usedGroups].map((g) => API_GROUPS[g] ?? { name: g, description: g }),
		paths: value.paths as OpenApiDocument['paths'],
		components: { schemas, securitySchemes: SECURITY_SCHEMES }
	};
}
