/**
 * Small building blocks of the API contract that more than one subject uses.
 */
import { z } from 'zod';

/** Who did something, as shown next to a change. */
export const personRefSchema = z.object({ email: z.string(), name: z.string().nullable() });
export type PersonRef = z.infer<typeof personRefSchema>;

/** An ISO 8601 date and time as the server writes it (`Date.prototype.toISOString`). */
export const timestampSchema = z.string();

/**
 * A shape the pure library (`src/lib/can`) defines as a TypeScript interface and the API passes
 * through untouched (a lint problem, a map diff, a bus-load result, an alert replay). Typed here
 * from the library's own declaration; `id` names it for documentation generated from the contract.
 */
export function libraryShape<T>(id: string, description: string) {
	return z.custom<T>(() => true).meta({ id, description });
}
