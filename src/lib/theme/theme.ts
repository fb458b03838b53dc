/**
 * Light/dark theme: the `dark` class on <html> (set before first paint by src/app.html),
 * remembered in localStorage under `fw-theme`; without a saved choice it follows the system.
 */
export type Theme = 'light' | 'dark';

export const THEME_STORAGE_KEY = 'fw-theme';

export function currentTheme(): Theme {
	return document.documentElement.classList.contains('dark') ? 'dark' : 'light';
}

function apply(theme: Theme): void {
	document.documentElement.classList.toggle('dark', theme === 'dark');
}

function savedTheme(): Theme | null {
	try {
		const t = localStorage.getItem(THEME_STORAGE_KEY);
		return t === 'dark' || t === 'light' ? t : null;
	} catch {
		return null; // storage blocked (private mode, policy): fall back to the system preference
	}
}

export function chooseTheme(theme: Theme): void {
	apply(theme);
	try {
		localStorage.setItem(THEME_STORAGE_KEY, theme);
	} catch {
		// the choice still holds for this page view
	}
}

/** Follows system changes while the user has made no choice; returns the unsubscribe function. */
export function followSystemTheme(onChange: (theme: Theme) => void): () => void {
	const query = window.matchMedia('(prefers-color-scheme: dark)');
	const listener = () => {
		if (savedTheme()) return;
		apply(query.matches ? 'dark' : 'light');
		onChange(currentTheme());
	};
	query.addEventListener('change', listener);
	return () => query.removeEventListener('change', listener);
}
