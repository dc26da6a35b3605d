// The Range header parser of scripts/serve.mjs, checked against the worked examples of
// RFC 9110 (HTTP Semantics, 2022), section 14.1.2, for a representation of 10000 bytes
// (the same examples as RFC 7233, section 2.1; recalled from memory), and against
// range-parser 1.3.0 (npm), the parser behind Express's static file serving.
import rangeParser from 'range-parser';
import { describe, expect, it } from 'vitest';
import { parseRangeHeader } from '../../scripts/http-range.mjs';

describe('RFC 9110, 14.1.2 examples on a 10000-byte representation', () => {
  const size = 10_000;
  it('"bytes=0-499" is the first 500 bytes', () => expect(parseRangeHeader('bytes=0-499', size)).toEqual({ kind: 'range', start: 0, end: 499 }));
  it('"bytes=500-999" is the second 500 bytes', () => expect(parseRangeHeader('bytes=500-999', size)).toEqual({ kind: 'range', start: 500, end: 999 }));
  it('"bytes=-500" is the final 500 bytes', () => expect(parseRangeHeader('bytes=-500', size)).toEqual({ kind: 'range', start: 9500, end: 9999 }));
  it('"bytes=9500-" is the final 500 bytes too', () => expect(parseRangeHeader('bytes=9500-', size)).toEqual({ kind: 'range', start: 9500, end: 9999 }));
  it('"bytes=0-0,-1" (first and last byte) asks for two ranges, which this server answers whole', () => {
    expect(parseRangeHeader('bytes=0-0,-1', size)).toEqual({ kind: 'none' });
  });
});

describe('RFC 9110, 14.1.1 and 14.1.2 rules', () => {
  it('cuts a last position at or past the end to the end', () => {
    expect(parseRangeHeader('bytes=9000-20000', 10_000)).toEqual({ kind: 'range', start: 9000, end: 9999 });
  });
  it('takes the whole representation for a suffix longer than it', () => {
    expect(parseRangeHeader('bytes=-20000', 10_000)).toEqual({ kind: 'range', start: 0, end: 9999 });
  });
  it('is unsatisfiable when the first position is at or past the end, or the suffix is zero', () => {
    expect(parseRangeHeader('bytes=10000-', 10_000)).toEqual({ kind: 'unsatisfiable' });
    expect(parseRangeHeader('bytes=20000-30000', 10_000)).toEqual({ kind: 'unsatisfiable' });
    expect(parseRangeHeader('bytes=-0', 10_000)).toEqual({ kind: 'unsatisfiable' });
  });
  it('ignores an invalid range (last before first), another unit, or garbage', () => {
    for (const header of ['bytes=500-100', 'items=0-5', 'bytes=a-b', 'bytes=-', 'bytes=', '0-499', undefined]) {
      expect(parseRangeHeader(header, 10_000), String(header)).toEqual({ kind: 'none' });
    }
  });
});

describe('agreement with range-parser 1.3.0 on single ranges', () => {
  // range-parser returns -1 (unsatisfiable), -2 (malformed) or a list of {start, end}.
  const headers = ['bytes=0-0', 'bytes=0-499', 'bytes=499-500', 'bytes=-1', 'bytes=-9999', 'bytes=9999-',
    'bytes=10000-', 'bytes=123-4567', 'bytes=5000-5000', 'bytes=9000-99999', 'bytes= 10-20', 'bytes=10-20 '];
  for (const size of [1, 100, 10_000]) {
    it.each(headers)(`%s on ${size} bytes`, (header) => {
      if (/^bytes=-(\d+)$/.test(header) && Number(header.slice(7)) > size) return; // see the next test
      const ours = parseRangeHeader(header, size);
      const theirs = rangeParser(size, header);
      if (theirs === -1) expect(ours).toEqual({ kind: 'unsatisfiable' });
      else if (theirs === -2) expect(ours).toEqual({ kind: 'none' });
      else {
        expect(theirs.length).toBe(1);
        expect(ours).toEqual({ kind: 'range', start: theirs[0].start, end: theirs[0].end });
      }
    });
  }
});

describe('where range-parser departs from the RFC', () => {
  it('a suffix longer than the file: the RFC sends the whole file, range-parser 1.3.0 calls it unsatisfiable', () => {
    // RFC 9110, 14.1.1: "If the selected representation is shorter than the specified
    // suffix-length, the entire representation is used." We follow the RFC.
    expect(rangeParser(100, 'bytes=-10001')).toBe(-1);
    expect(parseRangeHeader('bytes=-10001', 100)).toEqual({ kind: 'range', start: 0, end: 99 });
  });
});
