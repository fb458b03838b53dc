/**
 * Opens a store from its plain-data settings (BlobStorage.settings), in a capture worker thread or
 * another process. The S3 client is loaded only when the settings ask for it, so a worker on local
 * storage starts without it.
 */
import { createLocalStorage } from './local';
import type { BlobStorage, StorageSettings } from './storage';

export async function storageFromSettings(settings: StorageSettings): Promise<BlobStorage> {
	if (settings.driver === 'local')
		return createLocalStorage({ root: settings.root, maxBytes: settings.maxBytes });
	const { createS3Storage } = await import('./s3');
	return createS3Storage(settings);
}
