import { json } from '@sveltejs/kit';
import type { OpenApiDocument } from '$lib/api/meta';
import { openApiDocument } from '$lib/api/openapi';
import type { RequestHandler } from './$types';

// Public: the description of the API holds nothing of any workspace.
export const GET: RequestHandler = async (event) => {
	const document = openApiDocument({ serverUrl: event.url.origin });
	return json(document satisfies OpenApiDocument);
};
