import type { RequestHandler, Response } from 'express';
import helmet from 'helmet';
import { newNonce } from './client-app';

/**
 * Security headers (helmet) with the app's Content-Security-Policy. Pages get a fresh nonce per
 * response (`res.locals.cspNonce`, put on `<app-root ngCspNonce>`), which Angular's own `<style>`
 * elements carry; API answers are JSON and get the same policy without a nonce, so they cost no
 * random bytes.
 */
export function securityHeaders(secureCookies: boolean): RequestHandler {
  const policy = (withNonce: boolean) =>
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          baseUri: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: withNonce ? ["'self'", (_req, res) => `'nonce-${(res as Response).locals['cspNonce']}'`] : ["'self'"],
          // Angular's [style] bindings and CDK overlays set style attributes through the CSSOM.
          styleSrcAttr: ["'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          mediaSrc: ["'self'", 'blob:'],
          fontSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          frameAncestors: ["'none'"],
          formAction: ["'self'"],
          upgradeInsecureRequests: secureCookies ? [] : null,
        },
      },
      // Let our own pages open frames/images cross-origin-isolated only where needed later.
      crossOriginEmbedderPolicy: false,
    });
  const api = policy(false);
  const pages = policy(true);
  return (req, res, next) => {
    if (req.url.startsWith('/api/')) return api(req, res, next);
    res.locals['cspNonce'] = newNonce();
    pages(req, res, next);
  };
}
