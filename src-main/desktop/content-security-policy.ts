/**
 * The Content-Security-Policy of the renderer, the same in Electron and in the browser host: only
 * the app's own scripts, styles, fonts and images; no inline or evaluated script, no plugins, no
 * frames, no forms posting elsewhere, and network access only to the app's own origin.
 *
 * Inline style attributes are allowed (`style-src-attr`) because Svelte and chart.js set element
 * styles; `<style>` elements and style sheets from elsewhere are not.
 */
export const contentSecurityPolicy = [
  "default-src 'none'",
  "script-src 'self'",
  "style-src 'self'",
  "style-src-attr 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "worker-src 'self'",
  "manifest-src 'self'",
  "object-src 'none'",
  "frame-src 'none'",
  "child-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
].join('; ');

/** Response headers the browser host sends with every answer. */
export const securityHeaders: Readonly<Record<string, string>> = {
  'content-security-policy': contentSecurityPolicy,
  'x-content-type-options': 'nosniff',
  'referrer-policy': 'no-referrer',
  'x-frame-options': 'DENY',
  'cross-origin-opener-policy': 'same-origin',
  'cross-origin-resource-policy': 'same-origin',
  'permissions-policy': 'camera=(), microphone=(), geolocation=(), usb=(), serial=(), hid=()',
};
