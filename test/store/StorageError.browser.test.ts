import { describe, expect, it } from 'vitest';
import { isQuotaError, storageError } from '../../src/store/StorageError.ts';

// The full-disk path end to end (a real QuotaExceededError from IndexedDB under a lowered
// quota) is in e2e/store-durability.e2e.ts; here, the shapes such errors arrive in.
describe('storage errors', () => {
  it('recognise a quota error arriving as the inner error of an abort', () => {
    const quota = new DOMException('The quota has been exceeded.', 'QuotaExceededError');
    expect(isQuotaError(quota)).toBe(true);
    expect(isQuotaError({ name: 'AbortError', message: 'Transaction aborted', inner: quota })).toBe(true);
    expect(isQuotaError({ name: 'AbortError', message: 'aborted', cause: { name: 'Error', inner: quota } })).toBe(true);
    expect(isQuotaError(new DOMException('aborted', 'AbortError'))).toBe(false);
  });

  it('say what to do, naming the site', () => {
    const quota = new DOMException('The quota has been exceeded.', 'QuotaExceededError');
    const error = storageError({ name: 'AbortError', inner: quota }, 'Upper basin');
    expect(error.kind).toBe('full');
    expect(error.message).toMatch(/^Site "Upper basin": the last change was not saved because the disk is full/);
    expect(error.message).toMatch(/Everything saved before it is kept/);
    expect(storageError(new DOMException('gone', 'InvalidStateError'), 'Upper basin').kind).toBe('unavailable');
    // a bare abort, as when the disk fills before the quota: still told as a refused write
    const refused = storageError({ name: 'AbortError', message: 'The transaction was aborted', inner: null }, 'Upper basin');
    expect(refused.kind).toBe('refused');
    expect(refused.message).toMatch(/^Site "Upper basin": the last change was not saved because the browser's storage refused it \(AbortError: The transaction was aborted\); a full disk is the usual cause/);
    expect(storageError(new DOMException('dup', 'ConstraintError'), 'Upper basin').kind).toBe('other');
    // a bulk write of Dexie failing because its transaction was aborted (seen with the disk full)
    const bulk = storageError({ name: 'BulkError', message: 'patches.bulkPut(): 1 of 1 operations failed', failures: [new DOMException('The transaction was aborted', 'AbortError')] }, 'Upper basin');
    expect(bulk.kind).toBe('refused');
    expect(bulk.message).toMatch(/^Site "Upper basin": the last change was not saved because the browser's storage refused it \(BulkError: /);
    const bulkQuota = storageError({ name: 'BulkError', message: 'tags.bulkPut(): 1 of 2 operations failed', failures: [new DOMException('The quota has been exceeded.', 'QuotaExceededError')] }, 'Upper basin');
    expect(bulkQuota.kind).toBe('full');
    // a bulk write refused for a reason of its own is not a full disk
    expect(storageError({ name: 'BulkError', message: 'x', failures: [new DOMException('dup', 'ConstraintError')] }, 'Upper basin').kind).toBe('other');
  });
});
