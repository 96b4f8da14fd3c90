import type { Request, RequestHandler, Response } from 'express';
import helmet from 'helmet';
import { newNonce } from './client-app';

/**
 * Security headers (helmet) with the app's Content-Security-Policy. Pages get a fresh nonce per
 * response (`res.locals.cspNonce`, put on `<app-root ngCspNonce>`), which Angular's own `<style>`
 * elements carry; API answers are JSON and get the same policy without a nonce: those headers
 * never change, so helmet computes them once and each API answer only sets them.
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
  // API answers are never cached (stored files served under /api set their own Cache-Control).
  const api = [...fixedHeaders(policy(false)), ['Cache-Control', 'no-store']] as [string, string | string[]][];
  const pages = policy(true);
  return (req, res, next) => {
    if (req.url.startsWith('/api/') || req.url === '/api' || req.url.startsWith('/api?')) {
      for (const [name, value] of api) res.setHeader(name, value);
      return next();
    }
    res.locals['cspNonce'] = newNonce();
    pages(req, res, next);
  };
}

/** The headers a helmet middleware without per-request directives sets, recorded once. */
function fixedHeaders(middleware: RequestHandler): [string, string | string[]][] {
  const headers: [string, string | string[]][] = [];
  const recorder = {
    locals: {},
    setHeader: (name: string, value: string | string[]) => headers.push([name, value]),
    removeHeader: () => undefined,
    getHeader: () => undefined,
  };
  let called = false;
  void middleware({ url: '/api/', headers: {} } as Request, recorder as unknown as Response, () => (called = true));
  if (!called) throw new Error('the security headers could not be computed ahead');
  return headers;
}
