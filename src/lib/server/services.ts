import type { AppConfig } from './config';
import type { DB } from './db/connection';
import type { MailLimits } from './mail/limits';
import type { SendMail } from './mail/send';
import type { BlobStorage } from './storage/storage';

/**
 * Process-wide dependencies handed to requests through `event.locals.services` (made once by
 * `startup.ts`; tests build their own with `test-support.ts`).
 */
export interface Services {
	db: DB;
	config: AppConfig;
	sendMail: SendMail;
	secret?: string;
	/** Capture files and their processed frame stores (local folder or S3). */
	storage: BlobStorage;
	/** How much mail one account or client address may cause (`mail/limits.ts`). */
	mailLimits: MailLimits;
}
