import { fileTooLarge, MAX_FILE_BYTES } from './limits';

/**
 * Reads a stream whole, but stops and cancels it as soon as more than `max`
 * bytes have arrived, so an oversized upload is never held in memory.
 * Throws the `file-too-large` DatasetError.
 */
export async function limitBytes(stream: ReadableStream<Uint8Array>, max: number = MAX_FILE_BYTES): Promise<Uint8Array> {
	const reader = stream.getReader();
	const chunks: Uint8Array[] = [];
	let total = 0;
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) break;
			total += value.byteLength;
			if (total > max) {
				await reader.cancel('file too large').catch(() => {});
				throw fileTooLarge(undefined, max);
			}
			// copy: a producer may reuse its chunk buffer after enqueueing it
			chunks.push(value.slice());
		}
	} finally {
		reader.releaseLock();
	}
	return concatBytes(chunks, total);
}

/** The chunks of a stream as one array of its own (not a view of a shared pool). */
export function concatBytes(chunks: readonly Uint8Array[], total: number): Uint8Array {
	const out = new Uint8Array(total);
	let at = 0;
	for (const chunk of chunks) {
		out.set(chunk, at);
		at += chunk.byteLength;
	}
	return out;
}
