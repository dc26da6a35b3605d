// Errors of the platform bridge are typed and carry the file they concern, so callers
// can show one clear line ("pan.tif: ...") and react to the kind of failure.

export type PlatformErrorCode =
  | 'bad-request' // the caller passed something malformed (a negative offset, a bad name)
  | 'unknown-file' // the reference was never handed out, or was forgotten
  | 'not-found' // the file (demo or picked) is gone or was never there
  | 'out-of-range' // the requested bytes start past the end of the file
  | 'refused' // the request came from somewhere that may not ask
  | 'io' // the operating system or the network failed the read
  | 'full' // the disk (or the browser's storage quota) has no room for a write
  | 'aborted'; // the caller's AbortSignal fired

export class PlatformError extends Error {
  readonly code: PlatformErrorCode;
  /** The file name the error concerns, when there is one. */
  readonly file: string | undefined;
  /** The message without the file name in front (what crosses the IPC boundary). */
  readonly detail: string;

  constructor(code: PlatformErrorCode, detail: string, file?: string) {
    super(file ? `${file}: ${detail}` : detail);
    this.name = 'PlatformError';
    this.code = code;
    this.file = file;
    this.detail = detail;
  }
}

/** Throws the standard abort error when the signal has fired. */
export function throwIfAborted(signal: AbortSignal | undefined, file?: string): void {
  if (signal?.aborted) throw new PlatformError('aborted', 'the read was cancelled', file);
}
