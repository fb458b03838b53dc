/**
 * Progress of a long remote step on stderr: on a terminal one line redrawn in place, in a log (a CI
 * job) a line at every tenth, so stdout stays the result alone.
 */
export interface Progress {
	update(fraction: number, detail?: string): void;
	done(message: string): void;
}

export function progressReporter(
	label: string,
	stream: NodeJS.WriteStream = process.stderr
): Progress {
	let lastTenth = -1;
	let drawn = false;
	return {
		update(fraction, detail) {
			const percent = Math.floor(Math.min(1, Math.max(0, fraction)) * 100);
			const line = `${label} ${String(percent).padStart(3)}%${detail ? `  ${detail}` : ''}`;
			if (stream.isTTY) {
				stream.write(`\r${line}\u001b[K`);
				drawn = true;
			} else if (Math.floor(percent / 10) > lastTenth) {
				lastTenth = Math.floor(percent / 10);
				stream.write(`${line}\n`);
			}
		},
		done(message) {
			stream.write(`${drawn ? '\r\u001b[K' : ''}${label} ${message}\n`);
		}
	};
}

/** "1.2 MB", "640 kB", "12 B" (decimal units). */
export function formatBytes(bytes: number): string {
	if (bytes >= 1e6) return `${(bytes / 1e6).toFixed(1)} MB`;
	if (bytes >= 1e3) return `${(bytes / 1e3).toFixed(0)} kB`;
	return `${bytes} B`;
}
