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
	/** Demo/dev mode: stand-in SMTP server, /dev/mailbox, demo seed. */
	demoMode: boolean;
	smtp: { host: string; port: number; user?: string; pass?: string } | null;
	standInSmtpPort: number;
	mailFrom: string;
	sessionMaxAgeSeconds: number;
	signinLinksPerHour: number;
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
	return {
		// Without a real SMTP server there is no way to receive sign-in links except the demo mailbox.
		demoMode: e.FRAMEWRIGHT_DEMO || smtp === null || e.NODE_ENV === 'development',
		smtp,
		standInSmtpPort: e.STANDIN_SMTP_PORT,
		mailFrom: e.MAIL_FROM || 'Framewright <no-reply@framewright.test>',
		sessionMaxAgeSeconds: e.SESSION_MAX_AGE_DAYS * 24 * 60 * 60,
		signinLinksPerHour: e.SIGNIN_LINKS_PER_HOUR,
		signinLinkMaxAgeSeconds: e.SIGNIN_LINK_MAX_AGE_MINUTES * 60,
		invitationMaxAgeMs: e.INVITATION_MAX_AGE_DAYS * 24 * 60 * 60 * 1000,
		captureMaxBytes: e.CAPTURE_MAX_BYTES,
		captureWorkers: e.CAPTURE_WORKERS
	};
}
