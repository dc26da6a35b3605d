/** A file that cannot be imported: the message names the file and every problem found. */
export class ImportError extends Error {
  constructor(readonly fileName: string, readonly problems: string[]) {
    super(problems.length === 1 ? `${fileName}: ${problems[0]}` : `${fileName}: ${problems.length} problems:\n- ${problems.join('\n- ')}`);
    this.name = 'ImportError';
  }
}

/** Collects problems up to a limit, so a broken file of 10,000 features says enough, not everything. */
export class ProblemList {
  readonly items: string[] = [];
  private extra = 0;
  constructor(private readonly limit = 12) {}
  add(problem: string): void {
    if (this.items.length < this.limit) this.items.push(problem);
    else this.extra++;
  }
  get empty(): boolean {
    return this.items.length === 0;
  }
  throwIfAny(fileName: string): void {
    if (this.empty) return;
    throw new ImportError(fileName, this.extra ? [...this.items, `and ${this.extra} more`] : this.items);
  }
}
