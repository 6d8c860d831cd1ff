/**
 * The sizes a ZIP archive (an XLSX workbook) declares for its entries once
 * expanded, read from its central directory without expanding anything, so a
 * decompression bomb is refused before a byte of it is inflated. Layout from
 * PKWARE's APPNOTE.TXT (§4.3.16 end of central directory record, §4.3.12
 * central directory file header). ZIP64 archives declare sizes elsewhere; a
 * workbook within our 20 MB upload limit never needs them, so they are
 * reported as "unknown" and refused by the caller.
 */
interface ZipEntrySize {
	name: string;
	/** bytes once expanded; Infinity when the archive says "see ZIP64" */
	size: number;
	compressed: number;
}

const EOCD = 0x06054b50;
const CENTRAL = 0x02014b50;

/** The entries and their declared expanded sizes, or null when this is not a readable ZIP. */
export function zipEntrySizes(bytes: Uint8Array): ZipEntrySize[] | null {
	const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	// the EOCD record is 22 bytes plus a comment of at most 65,535 bytes, at the very end
	const lowest = Math.max(0, bytes.byteLength - 22 - 0xffff);
	let eocd = -1;
	for (let i = bytes.byteLength - 22; i >= lowest; i--) {
		if (view.getUint32(i, true) === EOCD) {
			eocd = i;
			break;
		}
	}
	if (eocd < 0) return null;
	const count = view.getUint16(eocd + 10, true);
	let at = view.getUint32(eocd + 16, true);
	const entries: ZipEntrySize[] = [];
	for (let k = 0; k < count; k++) {
		if (at + 46 > bytes.byteLength || view.getUint32(at, true) !== CENTRAL) return null;
		const compressed = view.getUint32(at + 20, true);
		const size = view.getUint32(at + 24, true);
		const nameLength = view.getUint16(at + 28, true);
		const extraLength = view.getUint16(at + 30, true);
		const commentLength = view.getUint16(at + 32, true);
		if (at + 46 + nameLength > bytes.byteLength) return null;
		const name = new TextDecoder().decode(bytes.subarray(at + 46, at + 46 + nameLength));
		entries.push({ name, size: size === 0xffffffff ? Infinity : size, compressed });
		at += 46 + nameLength + extraLength + commentLength;
	}
	return entries;
}
