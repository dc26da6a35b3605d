export interface StorageStatus {
  persisted: boolean;
  reason?: string;
}

/** Asks for persistent storage (so the engine will not evict sites) and reports the outcome. */
export async function storageStatus(): Promise<StorageStatus> {
  const storage = navigator.storage;
  if (!storage?.persist) return { persisted: false, reason: 'this browser cannot promise it' };
  try {
    if (await storage.persisted()) return { persisted: true };
    const granted = await storage.persist();
    return granted ? { persisted: true } : { persisted: false, reason: 'the browser declined the request' };
  } catch (error) {
    return { persisted: false, reason: (error as Error).message };
  }
}
