import { describe, expect, it } from 'vitest';
import { ApiError } from '$lib/api/client';
import { refusalFallback, uploadCapture, type UploadRequest } from './upload';

/** A stand-in XMLHttpRequest that records what was sent and answers when told to. */
class FakeRequest implements UploadRequest {
	method = '';
	url = '';
	headers: Record<string, string> = {};
	sent: Blob | null = null;
	aborted = false;
	status = 0;
	responseText = '';
	upload: UploadRequest['upload'] = { onprogress: null };
	onload: (() => void) | null = null;
	onerror: (() => void) | null = null;
	onabort: (() => void) | null = null;
	open(method: string, url: string) {
		this.method = method;
		this.url = url;
	}
	setRequestHeader(name: string, value: string) {
		this.headers[name] = value;
	}
	send(body: Blob) {
		this.sent = body;
	}
	abort() {
		this.aborted = true;
		this.onabort?.();
	}
	answer(status: number, body: string) {
		this.status = status;
		this.responseText = body;
		this.onload?.();
	}
}

const file = () =>
	Object.assign(new Blob(['time,id,extended,dlc,data\n0.1,100,0,1,AA\n']), { name: 'run.csv' });

describe('uploadCapture', () => {
	it('sends the file itself as the body and reports progress as a fraction of the bytes', async () => {
		const request = new FakeRequest();
		const seen: number[] = [];
		const f = file();
		const done = uploadCapture('/api/workspaces/w/captures?name=run.csv', f, {
			createRequest: () => request,
			onprogress: (p) => seen.push(p)
		});
		expect(request.method).toBe('POST');
		expect(request.url).toBe('/api/workspaces/w/captures?name=run.csv');
		expect(request.sent).toBe(f);
		request.upload.onprogress?.({ loaded: 10, total: 40, lengthComputable: true });
		request.upload.onprogress?.({ loaded: 5, total: 0, lengthComputable: false });
		request.answer(
			201,
			JSON.stringify({ capture: { id: 'c1' }, detected: { layout: {}, notes: [], sampleRows: [] } })
		);
		const answer = await done;
		expect(answer.capture.id).toBe('c1');
		expect(seen).toEqual([0.25, 1]);
	});

	it.each([
		[413, /larger than/],
		[415, /does not look like a capture/],
		[400, /empty/]
	])(
		'a %i without a message of its own becomes a sentence naming the file',
		async (status, words) => {
			const request = new FakeRequest();
			const done = uploadCapture('/u', file(), { createRequest: () => request });
			request.answer(status, '<html>proxy error</html>');
			const error = await done.catch((e: unknown) => e);
			expect(error).toBeInstanceOf(ApiError);
			expect((error as ApiError).status).toBe(status);
			expect((error as ApiError).message).toMatch(words);
			expect((error as ApiError).message).toContain('run.csv');
		}
	);

	it("prefers the server's own message and keeps its issues", async () => {
		const request = new FakeRequest();
		const done = uploadCapture('/u', file(), { createRequest: () => request });
		request.answer(
			415,
			JSON.stringify({
				error: 'binary data in the first bytes',
				issues: [{ path: 'file', message: 'NUL byte at 12' }]
			})
		);
		const error = (await done.catch((e: unknown) => e)) as ApiError;
		expect(error.message).toBe('run.csv: binary data in the first bytes');
		expect(error.issues).toEqual([{ path: 'file', message: 'NUL byte at 12' }]);
	});

	it('a network failure and a cancel each reject with a readable message', async () => {
		const failing = new FakeRequest();
		const lost = uploadCapture('/u', file(), { createRequest: () => failing });
		failing.onerror?.();
		await expect(lost).rejects.toThrow(/stopped before the server answered.*size limit/);

		const cancelled = new FakeRequest();
		const controller = new AbortController();
		const stopped = uploadCapture('/u', file(), {
			createRequest: () => cancelled,
			signal: controller.signal
		});
		controller.abort();
		await expect(stopped).rejects.toThrow(/cancelled/);
		expect(cancelled.aborted).toBe(true);
	});

	it('an unknown status still gives a message with the status', () => {
		expect(refusalFallback(502, 'a.csv')).toMatch(/502/);
	});
});
