import { DatasetError } from './datasetError';

const SAMPLE_BYTES = 64 * 1024;
// Binary files are full of control bytes and invalid UTF-8; text in a legacy
// 8-bit encoding has none of the former and only a few of the latter.
const MAX_CONTROL_RATIO = 0.01;
const MAX_INVALID_RATIO = 0.1;

/**
 * Bytes of a CSV/TSV upload → text. Strips a BOM, reads UTF-16 when a BOM
 * says so, falls back to Windows-1252 for text that is nearly UTF-8, and
 * rejects binary content with `not-text`.
 */
export function decodeText(bytes: Uint8Array): { text: string; notes: string[] } {
	const notes: string[] = [];
	if (bytes[0] === 0xff && bytes[1] === 0xfe) {
		notes.push('the file is UTF-16 (little-endian) text');
		return { text: new TextDecoder('utf-16le').decode(bytes), notes };
	}
	if (bytes[0] === 0xfe && bytes[1] === 0xff) {
		notes.push('the file is UTF-16 (big-endian) text');
		return { text: new TextDecoder('utf-16be').decode(bytes), notes };
	}

	const sample = bytes.subarray(0, SAMPLE_BYTES);
	let controls = 0;
	for (const b of sample) {
		if (b === 0) throw notText('it contains NUL bytes');
		// tab, LF, VT, FF, CR and ESC-free text; anything else below 0x20 is binary
		if (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0b && b !== 0x0c && b !== 0x0d) controls++;
	}
	if (controls > MAX_CONTROL_RATIO * sample.length) {
		throw notText(`${percent(controls / sample.length)} of its first bytes are control characters`);
	}

	try {
		// TextDecoder drops a UTF-8 BOM by default
		return { text: new TextDecoder('utf-8', { fatal: true }).decode(bytes), notes };
	} catch {
		const loose = new TextDecoder('utf-8').decode(sample);
		let invalid = 0;
		for (let i = 0; i < loose.length; i++) if (loose.charCodeAt(i) === 0xfffd) invalid++;
		if (invalid > MAX_INVALID_RATIO * loose.length) {
			throw notText(`${percent(invalid / loose.length)} of it is not valid UTF-8`);
		}
		notes.push('the file is not valid UTF-8; it was read as Windows-1252 (Latin-1) text');
		return { text: new TextDecoder('windows-1252').decode(bytes), notes };
	}
}

function notText(why: string): DatasetError {
	return new DatasetError(
		'not-text',
		`the file is not a text table (${why}); upload CSV, TSV or XLSX`
	);
}

function percent(x: number): string {
	return `${Math.round(x * 100)}%`;
}
