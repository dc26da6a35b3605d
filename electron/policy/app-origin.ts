// The app is served from one origin of a custom scheme, app://fellfield. Origins are
// compared on parsed URLs (scheme, host, port, no credentials), never on string
// prefixes: "app://fellfield.evil/" and "app://fellfield@evil/" start with the same text.

export const APP_SCHEME = 'app';
export const APP_HOST = 'fellfield';
export const APP_ORIGIN = `${APP_SCHEME}://${APP_HOST}`;
export const APP_ENTRY_URL = `${APP_ORIGIN}/index.html`;

/** The parsed URL, or undefined when the text is not a URL at all. */
export function parseUrl(text: unknown): URL | undefined {
  if (typeof text !== 'string') return undefined;
  try {
    return new URL(text);
  } catch {
    return undefined;
  }
}

/** True when the URL belongs to the app's own origin. */
export function isAppUrl(text: unknown): boolean {
  const url = parseUrl(text);
  return (
    url !== undefined &&
    url.protocol === `${APP_SCHEME}:` &&
    url.hostname === APP_HOST &&
    url.port === '' &&
    url.username === '' &&
    url.password === ''
  );
}

/** Navigation of the window is allowed only within the app's origin (a reload, a hash). */
export function mayNavigate(url: unknown): boolean {
  return isAppUrl(url);
}

/** In-page URL schemes the app's own pages make (images, workers, decoded tiles), and the developer tools. */
const IN_PAGE_SCHEMES = new Set(['data:', 'blob:', 'devtools:']);

/** Whether the session may load a URL at all: our origin and in-page URLs, never the network or file://. */
export function mayLoad(url: unknown): boolean {
  if (isAppUrl(url)) return true;
  const parsed = parseUrl(url);
  return parsed !== undefined && IN_PAGE_SCHEMES.has(parsed.protocol);
}

/** The app opens no windows of its own and no remote pages: every request is denied. */
export function windowOpenDecision(_url: unknown): { action: 'deny' } {
  return { action: 'deny' };
}
