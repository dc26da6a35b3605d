// The policy is parsed with content-security-policy-parser 0.6.0 (npm), which follows
// the W3C CSP Level 3 "parse a serialized CSP" algorithm; the header policy and the
// <meta> policy of index.html must be the same, and script-src must be 'self' alone.
import parseContentSecurityPolicy from 'content-security-policy-parser';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { CONTENT_SECURITY_POLICY, contentTypeFor, securityHeaders } from '../../electron/policy/csp.ts';

describe('the content security policy', () => {
  const policy = parseContentSecurityPolicy(CONTENT_SECURITY_POLICY);

  it('allows scripts from the app itself only', () => {
    expect(policy.get('script-src')).toEqual(["'self'"]);
    expect(policy.get('default-src')).toEqual(["'self'"]);
    expect(policy.get('object-src')).toEqual(["'none'"]);
    expect(policy.get('connect-src')).toEqual(["'self'"]); // no remote content
    for (const [directive, sources] of policy) {
      expect(sources, directive).not.toContain("'unsafe-eval'");
      expect(sources.some((s) => /^(https?:|\*)/.test(s)), directive).toBe(false);
    }
  });

  it('is the same policy as the <meta> tag in index.html, less what a <meta> cannot carry', () => {
    const html = readFileSync(new URL('../../index.html', import.meta.url), 'utf8');
    const meta = /<meta\s+http-equiv="Content-Security-Policy"\s+content="([^"]+)"/i.exec(html);
    expect(meta).not.toBeNull();
    // CSP Level 3, section 3.3: frame-ancestors, report-uri and sandbox are not
    // supported in a <meta> policy, so only the header carries them.
    const headerOnly = new Set(['frame-ancestors', 'report-uri', 'sandbox']);
    const expected = new Map([...policy].filter(([directive]) => !headerOnly.has(directive)));
    expect(parseContentSecurityPolicy(meta![1])).toEqual(expected);
    expect(policy.get('frame-ancestors')).toEqual(["'none'"]);
  });

  it('is sent with the other security headers', () => {
    expect(securityHeaders()).toMatchObject({ 'Content-Security-Policy': CONTENT_SECURITY_POLICY, 'X-Content-Type-Options': 'nosniff' });
  });

  it('names content types by extension, defaulting to octet-stream', () => {
    expect(contentTypeFor('index.html')).toBe('text/html; charset=utf-8');
    expect(contentTypeFor('assets/INDEX.JS')).toBe('text/javascript; charset=utf-8');
    expect(contentTypeFor('pan.tif')).toBe('image/tiff');
    expect(contentTypeFor('README')).toBe('application/octet-stream');
  });
});
