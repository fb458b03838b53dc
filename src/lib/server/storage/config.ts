/**
 * Picks the blob store from the environment: the local filesystem (default, under STORAGE_ROOT) or
 * S3-compatible object storage (STORAGE_DRIVER=s3). Settings are checked with zod once, and a bad
 * or missing one names the variable (see .env.example).
 */
import { z } from 'zod';
import { createLocalStorage, DEFAULT_STORAGE_ROOT } from './local';
import { createS3Storage } from './s3';
import type { BlobStorage } from './storage';

const flag = z
	.enum(['1', '0', 'true', 'false', 'yes', 'no', ''])
	.optional()
	.transform((v) => v === '1' || v === 'true' || v === 'yes');

const storageEnvSchema = z.discriminatedUnion('STORAGE_DRIVER', [
	z.object({
		STORAGE_DRIVER: z.literal('local'),
		STORAGE_ROOT: z.string().optional()
	}),
	z.object({
		STORAGE_DRIVER: z.literal('s3'),
		S3_BUCKET: z
			.string({ error: 'S3_BUCKET is required with STORAGE_DRIVER=s3' })
			.min(1, 'S3_BUCKET is required with STORAGE_DRIVER=s3'),
		S3_REGION: z.string().optional(),
		S3_ENDPOINT: z
			.url({ error: 'S3_ENDPOINT must be a URL such as http://127.0.0.1:9000' })
			.optional()
			.or(z.literal('')),
		S3_ACCESS_KEY_ID: z.string().optional(),
		S3_SECRET_ACCESS_KEY: z.string().optional(),
		S3_FORCE_PATH_STYLE: flag,
		S3_PREFIX: z
			.string()
			.regex(
				/^([A-Za-z0-9][A-Za-z0-9._-]*\/)*$/,
				'S3_PREFIX must be empty or folders ending in "/"'
			)
			.optional()
	})
]);

export function storageSettingsFromEnv(env: Record<string, string | undefined> = process.env) {
	const parsed = storageEnvSchema.safeParse({
		...env,
		STORAGE_DRIVER: env.STORAGE_DRIVER || 'local'
	});
	if (!parsed.success) {
		const detail = parsed.error.issues
			.map((i) => `${i.path.join('.') || 'STORAGE_DRIVER'}: ${i.message}`)
			.join('; ');
		throw new Error(
			`Bad storage settings — ${detail}. STORAGE_DRIVER is "local" or "s3"; see .env.example.`
		);
	}
	return parsed.data;
}

/** The configured store; `maxBytes` caps any one blob (the capture upload limit is applied per put). */
export function storageFromEnv(
	env: Record<string, string | undefined> = process.env,
	maxBytes?: number
): BlobStorage {
	const e = storageSettingsFromEnv(env);
	if (e.STORAGE_DRIVER === 'local')
		return createLocalStorage({ root: e.STORAGE_ROOT || DEFAULT_STORAGE_ROOT, maxBytes });
	return createS3Storage({
		bucket: e.S3_BUCKET,
		region: e.S3_REGION || 'us-east-1',
		endpoint: e.S3_ENDPOINT || undefined,
		accessKeyId: e.S3_ACCESS_KEY_ID || undefined,
		secretAccessKey: e.S3_SECRET_ACCESS_KEY || undefined,
		forcePathStyle: e.S3_FORCE_PATH_STYLE,
		prefix: e.S3_PREFIX || '',
		maxBytes
	});
}
