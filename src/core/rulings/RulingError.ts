/**
 * A ruling that cannot be recorded or reopened as asked. Thrown before anything is
 * written, so the ledger and every earlier ruling stay as they were. `patchId` names
 * the patch it was about, so a screen can keep the patch in hand.
 */
export class RulingError extends Error {
  override name = 'RulingError';
  constructor(message: string, readonly patchId: string | null = null) {
    super(message);
  }
}
