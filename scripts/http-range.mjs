// The Range request header of RFC 9110 (section 14.1.2), for one range: what part of
// a representation of `size` bytes a request asks for.
//
// Returns { kind: 'none' } when there is no usable Range (absent, malformed, another
// unit, or several ranges: a server may then send the whole file, RFC 9110 14.2),
// { kind: 'unsatisfiable' } for a 416, or { kind: 'range', start, end } (end inclusive).

const SPEC = /^\s*(\d*)\s*-\s*(\d*)\s*$/;

/**
 * @param {string | undefined} header
 * @param {number} size
 * @returns {{kind: 'none'} | {kind: 'unsatisfiable'} | {kind: 'range', start: number, end: number}}
 */
export function parseRangeHeader(header, size) {
  if (typeof header !== 'string') return { kind: 'none' };
  const match = /^\s*bytes\s*=(.*)$/i.exec(header);
  if (!match) return { kind: 'none' };
  const specs = match[1].split(',').filter((part) => part.trim() !== '');
  if (specs.length !== 1) return { kind: 'none' };
  const spec = SPEC.exec(specs[0]);
  if (!spec || (spec[1] === '' && spec[2] === '')) return { kind: 'none' };
  if (spec[1] === '') {
    // A suffix range: the last N bytes.
    const suffix = Number(spec[2]);
    if (suffix === 0 || size === 0) return { kind: 'unsatisfiable' };
    return { kind: 'range', start: Math.max(0, size - suffix), end: size - 1 };
  }
  const start = Number(spec[1]);
  const last = spec[2] === '' ? Infinity : Number(spec[2]);
  if (!Number.isSafeInteger(start) || (last !== Infinity && !Number.isSafeInteger(last))) return { kind: 'none' };
  if (last < start) return { kind: 'none' }; // invalid per 14.1.1: ignore the header
  if (start >= size) return { kind: 'unsatisfiable' };
  return { kind: 'range', start, end: Math.min(last, size - 1) };
}
