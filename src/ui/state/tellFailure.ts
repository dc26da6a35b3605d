/**
 * Runs a change the page asked for: true once it is done; when it fails, its message is
 * told (one line, for the page to show) and the outcome is false.
 */
export async function tellFailure(work: () => Promise<void>, tell: (message: string) => void): Promise<boolean> {
  try {
    await work();
    return true;
  } catch (error) {
    tell((error as Error).message);
    return false;
  }
}
