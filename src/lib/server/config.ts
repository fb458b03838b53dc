import { z } from 'zod';

const flag = z
	.enum(['1', '0', 'true', 'false', 'yes', 'no', ''])
	.optional()
	.transform((v) => v === '1' || v === 'true' || v === 'yes');

const positiveInt = (fallback: number) =>
	z
		.string()
		.optional()
		.transform((v) => (v === undefined || v === '' ? fallback : Number(v)))
		.pipe(z.number().int().positive());

// Every setting the server reads from the environment, in one place, validated once.
const envSchema = z.object({
	FRAMEWRIGHT_DEMO: flag,
	ORIGIN: z.union([z.url({ protocol: /^https?$/ }), z.literal('')]).optional(),
	NODE_ENV: z.string().optional(),
	SMTP_HOST: z.string().optional(),
	SMTP_PORT: positiveInt(587),
	SMTP_USER: z.string().optional(),
	SMTP_PASS: z.string().optional(),
	MAIL_FROM: z.string().optional(),
	STANDIN_SMTP_PORT: z
		.string()
		.optional()
		.transform((v) => (v === undefined || v === '' ? 2525 : Number(v)))
		.pipe(z.number().int().min(0).max(65535)),
	SESSION_MAX_AGE_DAYS: positiveInt(30),
	SIGNIN_LINKS_PER_HOUR: positiveInt(5),
	SIGNIN_REQUESTS_PER_CLIENT_PER_HOUR: positiveInt(30),
	INVITATIONS_PER_ACCOUNT_PER_HOUR: positiveInt(30),
	INVITATIONS_PER_CLIENT_PER_HOUR: positiveInt(60),
	SIGNIN_LINK_MAX_AGE_MINUTES: positiveInt(60),
	INVITATION_MAX_AGE_DAYS: positiveInt(7),
	CAPTURE_MAX_BYTES: positiveInt(4 * 1024 ** 3),
	CAPTURE_WORKERS: z
		.string()
		.optional()
		.transform((v) => (v === undefined || v === '' ? null : Number(v)))
		.pipe(z.number().int().min(1).max(64).nullable())
});

export interface AppConfig {
	/** The public address (ORIGIN), e.g. https://framewright.example.test; null in `vite dev`. */
	origin: string | null;
	/** Cookies are `Secure` (with `__Secure-`/`__Host-` names) exactly when ORIGIN is https. */
	secureCookies: boolean;
	/** Demo/dev mode: stand-in SMTP server, /dev/mailbox, demo seed. */
	demoMode: boolean;
	smtp: { host: string; port: number; user?: string; pass?: string } | null;
	standInSmtpPort: number;
	mailFrom: string;
	/** Whether MAIL_FROM was set (the default sender's domain does not exist). */
	mailFromSet: boolean;
	sessionMaxAgeSeconds: number;
	signinLinksPerHour: number;
	/** Sign-in requests one client address may make per hour (any addresses). */
	signinRequestsPerClientPerHour: number;
	/** Invitations one account, and one client address, may send per hour. */
	invitationsPerAccountPerHour: number;
	invitationsPerClientPerHour: number;
	signinLinkMaxAgeSeconds: number;
	invitationMaxAgeMs: number;
	/** Largest capture upload in bytes (default 4 GiB: an hour of a saturated 1 Mbit/s bus is about 1.3 GB of CSV). */
	captureMaxBytes: number;
	/** Capture worker threads; null = one per core. */
	captureWorkers: number | null;
}

export function loadConfig(env: Record<string, string | undefined> = process.env): AppConfig {
	const parsed = envSchema.safeParse(env);
	if (!parsed.success) {
		const detail = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
		throw new Error(`Bad environment settings — ${detail}. See .env.example.`);
	}
	const e = parsed.data;
	const smtp = e.SMTP_HOST
		? { host: e.SMTP_HOST, port: e.SMTP_PORT, user: e.SMTP_USER, pass: e.SMTP_PASS }
		: null;
	const origin = e.ORIGIN ? new URL(e.ORIGIN).origin : null;
	return {
		origin,
		secureCookies: origin?.startsWith('https:') ?? false,
		// Only when asked for (`npm run demo`, FRAMEWRIGHT_DEMO=1) or in `vite dev`: demo mode shows
		// every sign-in link at /dev/mailbox, so a missing mail setting must never switch it on.
		demoMode: e.FRAMEWRIGHT_DEMO || e.NODE_ENV === 'development',
		mailFromSet: Boolean(e.MAIL_FROM),
		smtp,
		standInSmtpPort: e.STANDIN_SMTP_PORT,
		mailFrom: e.MAIL_FROM || 'Framewright <no-reply@framewright.test>',
		sessionMaxAgeSeconds: e.SESSION_MAX_AGE_DAYS * 24 * 60 * 60,
		signinLinksPerHour: e.SIGNIN_LINKS_PER_HOUR,
		signinRequestsPerClientPerHour: e.SIGNIN_REQUESTS_PER_CLIENT_PER_HOUR,
		invitationsPerAccountPerHour: e.INVITATIONS_PER_ACCOUNT_PER_HOUR,
		invitationsPerClientPerHour: e.INVITATIONS_PER_CLIENT_PER_HOUR,
		signinLinkMaxAgeSeconds: e.SIGNIN_LINK_MAX_AGE_MINUTES * 60,
		invitationMaxAgeMs: e.INVITATION_MAX_AGE_DAYS * 24 * 60 * 60 * 1000,
		captureMaxBytes: e.CAPTURE_MAX_BYTES,
		captureWorkers: e.CAPTURE_WORKERS
	};
}

/**
 * Why the server must not start with these settings, or null. Outside demo mode it needs a mail
 * server (sign-in links and invitations go out by e-mail), a sender address, and its public
 * address (the links in those mails). `scripts/serve.js` prints this and exits; startup throws it.
 */
export function startupProblem(config: AppConfig): string | null {
	if (config.demoMode) return null;
	const missing = [
		config.smtp
			? null
			: 'SMTP_HOST (with SMTP_PORT, SMTP_USER, SMTP_PASS as your mail server needs)',
		config.mailFromSet ? null : 'MAIL_FROM',
		config.origin ? null : 'ORIGIN'
	].filter((m): m is string => m !== null);
	if (missing.length === 0) return null;
	return [
		`Framewright will not start: it needs ${missing.join(', ')}.`,
		'Set them in the environment or in a .env file (see .env.example and "Running in production" in README.md).',
		'To try Framewright without a mail server, run `npm run demo` or set FRAMEWRIGHT_DEMO=1: demo mode keeps',
		'every e-mail on this machine and shows anyone the sign-in links at /dev/mailbox, so it is not for a shared server.'
	].join('\n');
}
