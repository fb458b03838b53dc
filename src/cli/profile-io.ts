/** File access for the receiver commands (kept out of io.ts so other commands do not load mathjs). */
import { parseJsonDocument } from '../lib/can/map-json';
import { synonymTableSchema, type SynonymTable } from '../lib/can/receivers/names';
import { parseProfile, type ReceiverProfile } from '../lib/can/receivers/profile';
import { readDocument } from './io';

export function readProfileFile(path: string): Promise<ReceiverProfile> {
	return readDocument(path, 'receiver profile', parseProfile);
}

/** A workspace's additions to the built-in synonyms (the shape of receivers/synonyms.json). */
export function readSynonymsFile(path: string): Promise<SynonymTable> {
	return readDocument(path, 'synonym table', (text) =>
		parseJsonDocument(text, synonymTableSchema, 'synonyms')
	);
}
