import type { PersonRef } from '../api/shapes';

/** A user joined to a row (email, name), or null when the row has no user (or the account is gone). */
export function personRef(email: string | null, name: string | null): PersonRef | null {
	return email === null ? null : { email, name };
}

/** How a change names its author in a sentence. */
export function personLabel(person: PersonRef | null): string {
	return person ? (person.name ?? person.email) : 'someone';
}
