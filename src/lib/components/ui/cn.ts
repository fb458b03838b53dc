import { twMerge } from 'tailwind-merge';

export type ClassPart = string | false | null | undefined;

/**
 * Joins class lists, the later winning where two Tailwind utilities set the same property, so a
 * caller's `class` can adjust a kit part's defaults (`font-normal` over the header cell's `font-medium`).
 */
export function cn(...parts: ClassPart[]): string {
	return twMerge(parts.filter(Boolean).join(' '));
}
