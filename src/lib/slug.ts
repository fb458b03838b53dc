/**
 * A URL- and file-name-safe form of a name: accents dropped, lowercase ASCII letters, digits and single
 * hyphens, at most 48 characters; `fallback` when nothing is left. Pure, so the core, the server and the
 * browser share it.
 */
export function slugPart(name: string, fallback: string): string {
	const slug = name
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '')
		.slice(0, 48)
		.replace(/-+$/, '');
	return slug || fallback;
}
