import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';
import { describe, expect, it } from 'vitest';
import { canonicalJson, CanonicalJsonError } from '../../../src/core/ledger/canonicalJson.ts';
import { verifyChain } from '../../../src/core/ledger/chain.ts';
import { sha256Hex } from '../../../src/core/ledger/sha256.ts';
import type { LedgerEvent } from '../../../src/core/site/index.ts';
import { buildSite } from '../site/scenario.ts';
import { seeded } from '../../../bench/harness.ts';

describe('sha256Hex', () => {
  it('matches the FIPS 180-2 example and node:crypto', async () => {
    // FIPS PUB 180-2 (2002), Appendix B.1: SHA-256("abc").
    expect(await sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    const bytes = new Uint8Array(100_000).map((_, i) => (i * 31) & 255);
    expect(await sha256Hex(bytes)).toBe(createHash('sha256').update(bytes).digest('hex'));
  });
});

describe('canonicalJson', () => {
  it('writes the RFC 8785 section 3.2.2 sample as the RFC prints it', () => {
    // RFC 8785 (2020) §3.2.2 input and its canonical output, §3.2.3 sorting example.
    const input = { numbers: [333333333.3333333, // the RFC writes 333333333.33333329, the same double
      1e30, 4.5, 2e-3, 0.000000000000000000000000001], string: '\u20ac$\u000F\u000aA\'\u0042\u0022\u005c\\"/', literals: [null, true, false] };
    expect(canonicalJson(input)).toBe(
      '{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\\u000f\\nA\'B\\"\\\\\\\\\\"/"}',
    );
    const sorting = { '\u20ac': 'Euro Sign', '\r': 'Carriage Return', '\ufb33': 'Hebrew Letter Dalet With Dagesh', '1': 'One', '\ud83d\ude00': 'Emoji: Grinning Face', '\u0080': 'Control', '\u00f6': 'Latin Small Letter O With Diaeresis' };
    // read the order off the text: JSON.parse would put the integer-like key '1' first
    const text = canonicalJson(sorting);
    const order = Object.values(sorting).sort((a, b) => text.indexOf(a) - text.indexOf(b));
    expect(order).toEqual([
      'Carriage Return', 'One', 'Control', 'Latin Small Letter O With Diaeresis', 'Euro Sign', 'Emoji: Grinning Face', 'Hebrew Letter Dalet With Dagesh',
    ]);
  });

  it('agrees with the canonicalize package (npm, 2.1.0) on random documents', () => {
    const random = seeded(7);
    const pick = (depth: number): unknown => {
      const r = random();
      if (depth > 3 || r < 0.3) return [null, true, false, random() * 1e6 - 5e5, Math.floor(random() * 100), `k${random().toString(36)}é\n`][Math.floor(random() * 6)];
      if (r < 0.6) return Array.from({ length: Math.floor(random() * 4) }, () => pick(depth + 1));
      return Object.fromEntries(Array.from({ length: Math.floor(random() * 5) }, () => [random().toString(36).slice(2, 5) + (random() < 0.2 ? 'Ä' : ''), pick(depth + 1)]));
    };
    for (let i = 0; i < 300; i++) {
      const doc = pick(0);
      expect(canonicalJson(doc)).toBe(canonicalize(doc));
    }
  });

  it('refuses values JSON cannot hold, naming where', () => {
    expect(() => canonicalJson({ a: [1, NaN] })).toThrow(CanonicalJsonError);
    expect(() => canonicalJson({ a: { b: Infinity } })).toThrow('a.b is Infinity');
  });
});

describe('verifyChain', () => {
  it('verifies a ledger and reports its head', async () => {
    const l = await buildSite();
    expect(await verifyChain(l.events)).toEqual({ ok: true, length: l.events.length, head: l.state.head.hash });
  });

  it('finds a change to any byte of the stored ledger', async () => {
    const l = await buildSite();
    const text = JSON.stringify(l.events.slice(0, 6));
    let checked = 0;
    for (let i = 0; i < text.length; i++) {
      for (const replacement of ['x', '7']) {
        if (text[i] === replacement) continue;
        const tampered = text.slice(0, i) + replacement + text.slice(i + 1);
        let events: LedgerEvent[];
        try {
          events = JSON.parse(tampered);
        } catch {
          continue; // no longer JSON: a reader refuses it before the chain is looked at
        }
        const check = await verifyChain(events);
        if (check.ok) throw new Error(`a change at byte ${i} went unnoticed: ${tampered.slice(Math.max(0, i - 20), i + 20)}`);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(text.length / 2);
  });

  it('tells where the chain breaks: a removed, reordered or rewritten event', async () => {
    const l = await buildSite();
    const e = l.events;
    expect(await verifyChain([...e.slice(0, 3), ...e.slice(4)])).toMatchObject({ ok: false, seq: 5, index: 3 });
    expect(await verifyChain([e[0], e[2], e[1]])).toMatchObject({ ok: false, index: 1 });
    const rewritten = e.map((x) => (x.seq === 7 ? { ...x, actor: 'someone else' } : x));
    const check = await verifyChain(rewritten);
    expect(check).toMatchObject({ ok: false, seq: 7 });
    expect(!check.ok && check.problem).toMatch(/changed after it was recorded/);
  });
});
