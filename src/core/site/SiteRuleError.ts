/** An event that cannot apply to the state it was offered to (a bug or a stale view). */
export class SiteRuleError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'SiteRuleError';
  }
}
