/**
 * The contract of the routes that describe the API itself (`/api/openapi.json`).
 */
import { z } from 'zod';

/** An OpenAPI 3.1 document, checked here only for its frame; `openapi.ts` builds the rest. */
export const openApiDocumentSchema = z.looseObject({
	openapi: z.literal('3.1.0'),
	info: z.looseObject({ title: z.string(), version: z.string() }),
	paths: z.record(z.string(), z.looseObject({})),
	components: z.looseObject({})
});
export type OpenApiDocument = z.infer<typeof openApiDocumentSchema>;
