/**
 * Small building blocks of the API contract that more than one subject uses.
 */
import { z } from 'zod';

/** Who did something, as shown next to a change. */
export const personRefSchema = z
	.object({ email: z.string(), name: z.string().nullable() })
	.meta({ id: 'Person', description: 'Who did something: e-mail address and display name.' });
export type PersonRef = z.infer<typeof personRefSchema>;

/** An ISO 8601 date and time as the server writes it (`Date.prototype.toISOString`). */
export const timestampSchema = z.string();

/**
 * A schema under a name of its own in documentation generated from the contract (OpenAPI
 * components): a copy of `schema` carrying `id` and `description`, validating exactly the same.
 */
export function named<S extends z.ZodType>(schema: S, id: string, description: string): S {
	return schema.meta({ id, description }) as S;
}
