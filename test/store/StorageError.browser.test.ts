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
  });
});
