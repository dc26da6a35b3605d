/**
 * A blind-pass request or file that cannot be used. `file` names the file when the
 * problem came from one, so the message can say which; nothing is merged when thrown.
 */
export class BlindError extends Error {
  override name = 'BlindError';
  constructor(message: string, readonly file: string | null = null) {
    super(file ? `${file}: ${message}` : message);
  }
}
