/** A problem the user can fix (bad file, tampered history, open disagreements), told in one line. */
export class ExportError extends Error {
  constructor(message: string, readonly file: string | null = null) {
    super(file ? `${file}: ${message}` : message);
    this.name = 'ExportError';
  }
}
