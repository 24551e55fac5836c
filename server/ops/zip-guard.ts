import { inflateRawSync } from 'node:zlib';
import { HttpError } from '../http-error.js';

/**
 * Zip-bomb guard for uploaded XLSX files (an XLSX is a ZIP archive, ISO/IEC 29500-2 / PKWARE
 * APPNOTE.TXT). The spreadsheet library inflates every part into memory, so a few hundred kilobytes
 * of crafted deflate data would otherwise become gigabytes. Before the workbook is handed over,
 * the central directory is read and every entry is inflated with a hard output cap: the declared
 * size (so a lying header is caught) and a budget for the whole archive.
 */

export const MAX_UNCOMPRESSED_BYTES = 200 * 1024 * 1024;
/** Real sheets compress 5–50x; deflate's ceiling is about 1032x. Above this ratio, large parts are refused. */
export const MAX_RATIO = 250;
const MAX_ENTRIES = 10_000;

export function assertSafeZip(fileName: string, buf: Buffer): void {
  const refuse = (why: string): never => {
    throw new HttpError(400, `"${fileName}" was refused: ${why}`);
  };
  const eocd = findEndOfCentralDirectory(buf);
  if (eocd < 0) refuse('it is not a readable ZIP/XLSX archive (no central directory)');
  const count = buf.readUInt16LE(eocd + 10);
  let p = buf.readUInt32LE(eocd + 16);
  if (count === 0xffff || p === 0xffffffff) refuse('ZIP64 archives are not accepted for imports');
  if (count > MAX_ENTRIES) refuse(`it has ${count} parts`);
  let total = 0;
  for (let i = 0; i < count; i++) {
    if (p + 46 > buf.length || buf.readUInt32LE(p) !== 0x02014b50) refuse('its central directory is damaged');
    const method = buf.readUInt16LE(p + 10);
    const compressed = buf.readUInt32LE(p + 20);
    const declared = buf.readUInt32LE(p + 24);
    const nameLen = buf.readUInt16LE(p + 28);
    const extraLen = buf.readUInt16LE(p + 30);
    const commentLen = buf.readUInt16LE(p + 32);
    const local = buf.readUInt32LE(p + 42);
    const name = buf.subarray(p + 46, p + 46 + nameLen).toString('utf8');
    p += 46 + nameLen + extraLen + commentLen;
    total += declared;
    if (total > MAX_UNCOMPRESSED_BYTES) refuse(`it unpacks to more than ${MAX_UNCOMPRESSED_BYTES / 1024 / 1024} MB (a "zip bomb" or far too large a sheet)`);
    if (declared > 1024 * 1024 && declared / Math.max(1, compressed) > MAX_RATIO) refuse(`part ${name} is compressed ${Math.round(declared / Math.max(1, compressed))}:1, typical of a zip bomb`);
    if (method === 0) continue;
    if (method !== 8) refuse(`part ${name} uses an unsupported compression method (${method})`);
    if (local + 30 > buf.length || buf.readUInt32LE(local) !== 0x04034b50) refuse(`part ${name} is damaged`);
    const start = local + 30 + buf.readUInt16LE(local + 26) + buf.readUInt16LE(local + 28);
    let out: Buffer;
    try {
      out = inflateRawSync(buf.subarray(start, start + compressed), { maxOutputLength: Math.max(1, declared) + 1 });
    } catch {
      // Expected for corrupt data and for parts that inflate beyond their declared size (a lying header).
      return refuse(`part ${name} does not unpack to its declared size (${declared} bytes)`);
    }
    if (out.length !== declared) refuse(`part ${name} unpacks to ${out.length} bytes, not the declared ${declared}`);
  }
}

function findEndOfCentralDirectory(buf: Buffer): number {
  // The record is 22 bytes plus a comment of at most 65 535 bytes, at the very end of the file.
  for (let i = buf.length - 22; i >= Math.max(0, buf.length - 22 - 65_535); i--) {
    if (buf.readUInt32LE(i) === 0x06054b50) return i;
  }
  return -1;
}
