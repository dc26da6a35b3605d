import { TiffError } from './errors.ts';

/** Reads `length` bytes at `offset` of a file (a file handle, a Blob, an IPC bridge). */
export type ReadRange = (offset: number, length: number) => Promise<Uint8Array>;

/**
 * A range reader that checks every request against the file size before reading, and
 * keeps the file's first bytes (where headers and IFDs usually sit) so small reads
 * there cost nothing.
 */
export class ByteSource {
  private head: Uint8Array = new Uint8Array(0);

  constructor(
    private readonly readRange: ReadRange,
    readonly fileSize: number,
    readonly fileName: string,
  ) {}

  async prefetch(length: number): Promise<void> {
    const n = Math.min(length, this.fileSize);
    if (n > 0) this.head = await this.fetch(0, n);
  }

  /** The bytes [offset, offset + length); 'truncated' if they run past the end. */
  async read(offset: number, length: number, what: string): Promise<Uint8Array> {
    if (!Number.isSafeInteger(offset) || !Number.isSafeInteger(length) || offset < 0 || length < 0) {
      throw new TiffError('truncated', this.fileName, `${what} has an impossible offset or size (${offset}, ${length})`);
    }
    if (offset + length > this.fileSize) {
      throw new TiffError(
        'truncated', this.fileName,
        `${what} lies past the end of the file (bytes ${offset}-${offset + length} of ${this.fileSize}): the file is truncated or damaged`,
      );
    }
    if (offset + length <= this.head.length) return this.head.subarray(offset, offset + length);
    return this.fetch(offset, length);
  }

  private async fetch(offset: number, length: number): Promise<Uint8Array> {
    const bytes = await this.readRange(offset, length);
    if (bytes.length < length) {
      throw new TiffError('truncated', this.fileName, `only ${bytes.length} of ${length} bytes could be read at offset ${offset}: the file is truncated`);
    }
    return bytes.length === length ? bytes : bytes.subarray(0, length);
  }
}
