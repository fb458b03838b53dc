import { openApiDocument } from '$lib/api/openapi';
import { referenceModel } from './reference-model';
import type { PageServerLoad } from './$types';

// Public, like /api/openapi.json: it describes the API, not any workspace's data.
export const load = (({ url }) => ({
	origin: url.origin,
	...referenceModel(openApiDocument({ serverUrl: url.origin }))
})) satisfies PageServerLoad;
