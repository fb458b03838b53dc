import { randomBytes } from 'node:crypto';
import { loadConfig, type AppConfig } from './config';
import { getDatabase, type DB } from './db';
import { createSendMail, type SendMail } from './mail/send';
import { startStandInSmtp, type StandInSmtp } from './mail/standin-smtp';
import { storageFromEnv, type BlobStorage } from './storage';
import { failInterruptedProcessing } from './captures/processing';
import { countUsers, seedDemo } from '../../../db/seed';

/** Process-wide dependencies handed to requests through `event.locals.services`. */
export interface Services {
	db: DB;
	config: AppConfig;
	sendMail: SendMail;
	secret?: string;
	/** Capture files and their processed frame stores (local folder or S3). */
	storage: BlobStorage;
}

async function startStandIn(db: DB, port: number): Promise<StandInSmtp> {
	try {
		return await startStandInSmtp(db, port);
	} catch (error) {
		// Only our own sendMail talks to it, so any free port will do when the usual one is taken.
		if ((error as NodeJS.ErrnoException).code !== 'EADDRINUSE') throw error;
		return startStandInSmtp(db, 0);
	}
}

async function createServices(): Promise<Services> {
	const config = loadConfig();
	const db = await getDatabase();
	// Room for a processed frame store next to an upload at the limit (it is smaller in practice).
	const storage = storageFromEnv(process.env, 4 * config.captureMaxBytes);
	await failInterruptedProcessing(db);
	let sendMail: SendMail;
	if (config.smtp) {
		sendMail = createSendMail(config.smtp, config.mailFrom);
	} else {
		const standIn = await startStandIn(db, config.standInSmtpPort);
		console.log(
			`Framewright demo mode: e-mail goes to the stand-in SMTP server on 127.0.0.1:${standIn.port}; read it at /dev/mailbox`
		);
		sendMail = createSendMail(
			{ host: '127.0.0.1', port: standIn.port, plain: true },
			config.mailFrom
		);
	}
	// Demo data only on a brand-new demo database, never on one people already use.
	if (config.demoMode && (await countUsers(db)) === 0) await seedDemo(db, { storage });
	let secret = process.env.AUTH_SECRET;
	if (!secret && config.demoMode) {
		// scripts/serve.js persists a secret; this covers `vite dev`, where sessions may end on restart.
		secret = randomBytes(32).toString('base64url');
	}
	return { db, config, sendMail, secret, storage };
}

// Kept on globalThis so Vite's module reloading in development does not start a second SMTP server.
const key = Symbol.for('framewright.services');
type Holder = { [key]?: Promise<Services> };

export function getServices(): Promise<Services> {
	const holder = globalThis as Holder;
	holder[key] ??= createServices().catch((error: unknown) => {
		delete holder[key];
		throw error;
	});
	return holder[key];
}
