/**
 * What went wrong with a TIFF, as a machine-readable code:
 * - `not-tiff`: the bytes are not a TIFF (or BigTIFF) at all;
 * - `truncated`: an offset or byte count points past the end of the file;
 * - `ifd-loop`: the chain of image directories comes back to one already read;
 * - `too-many-ifds`: more directories than the limit allows;
 * - `too-large`: a declared size (pixels, tag bytes, a tile) is past a safety cap;
 * - `no-georeference`: the file says nothing of where it lies (only where a caller requires it);
 * - `unsupported`: a valid TIFF feature this reader does not handle;
 * - `bad-tile`: a tile or strip does not decode to its declared size.
 */
export type TiffErrorCode =
  | 'not-tiff'
  | 'truncated'
  | 'ifd-loop'
  | 'too-many-ifds'
  | 'too-large'
  | 'no-georeference'
  | 'unsupported'
  | 'bad-tile';

/** A problem with one file, with the file's name at the start of the message. */
export class TiffError extends Error {
  readonly code: TiffErrorCode;
  readonly fileName: string;

  constructor(code: TiffErrorCode, fileName: string, detail: string) {
    super(fileName ? `${fileName}: ${detail}` : detail);
    this.name = 'TiffError';
    this.code = code;
    this.fileName = fileName;
  }
}

export function isTiffError(error: unknown): error is TiffError {
  return error instanceof TiffError;
}
