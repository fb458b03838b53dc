/** Blob storage: the interface callers depend on, and the local filesystem implementation. */
export * from './storage';
export {
	createLocalStorage,
	DEFAULT_MAX_BYTES,
	DEFAULT_STORAGE_ROOT,
	type LocalStorageOptions
} from './local';
export { createS3Storage, type S3StorageOptions } from './s3';
export { storageFromEnv, storageSettingsFromEnv } from './config';
export { storageFromSettings } from './settings';
