// Canonical JSON after RFC 8785 (JSON Canonicalization Scheme): object members sorted by
// their names' UTF-16 code units, no whitespace, numbers and strings as ECMAScript's
// JSON.stringify writes them. Members whose value is undefined are left out, as
// JSON.stringify does; a non-finite number is refused because JSON cannot hold it.

export class CanonicalJsonError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'CanonicalJsonError';
  }
}

/** Whether a value is an array holding only finite numbers and such arrays (coordinates). */
function isNumericTree(value: unknown[]): boolean {
  for (let i = 0; i < value.length; i++) {
    const item = value[i];
    if (typeof item === 'number') {
      if (!Number.isFinite(item)) return false;
    } else if (!Array.isArray(item) || !isNumericTree(item)) return false;
  }
  return true;
}

function write(value: unknown, out: string[], path: string): void {
  if (value === null) {
    out.push('null');
    return;
  }
  switch (typeof value) {
    case 'boolean':
      out.push(value ? 'true' : 'false');
      return;
    case 'number':
      if (!Number.isFinite(value)) throw new CanonicalJsonError(`${path || 'value'} is ${value}, which JSON cannot hold`);
      out.push(JSON.stringify(value));
      return;
    case 'string':
      out.push(JSON.stringify(value));
      return;
    case 'object': {
      if (Array.isArray(value)) {
        // Coordinates: arrays of numbers have no members to sort, so the engine's own
        // JSON.stringify writes them exactly as RFC 8785 does, and much faster.
        if (isNumericTree(value)) {
          out.push(JSON.stringify(value));
          return;
        }
        out.push('[');
        for (let i = 0; i < value.length; i++) {
          if (i) out.push(',');
          const item = value[i];
          write(item === undefined || typeof item === 'function' ? null : item, out, `${path}[${i}]`);
        }
        out.push(']');
        return;
      }
      const record = value as Record<string, unknown>;
      // Default sort compares UTF-16 code units, which is what RFC 8785 §3.2.3 asks for.
      const keys = Object.keys(record).filter((k) => record[k] !== undefined && typeof record[k] !== 'function').sort();
      out.push('{');
      keys.forEach((key, i) => {
        if (i) out.push(',');
        out.push(JSON.stringify(key), ':');
        write(record[key], out, path ? `${path}.${key}` : key);
      });
      out.push('}');
      return;
    }
    default:
      throw new CanonicalJsonError(`${path || 'value'} is a ${typeof value}, which JSON cannot hold`);
  }
}

export function canonicalJson(value: unknown): string {
  const out: string[] = [];
  write(value, out, '');
  return out.join('');
}
