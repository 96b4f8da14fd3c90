import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import express, { Router } from 'express';

/**
 * Serves the built Angular app: hashed bundles as static files (long cache), and `index.html`
 * for every other non-API path so deep links work. Each index.html gets a fresh CSP nonce on
 * `<app-root ngCspNonce>`, which Angular puts on the <style> elements it adds, so the CSP can
 * allow styles from 'self' and that nonce only.
 */
export function clientAppRoutes(clientDir: string): Router {
  const router = Router();
  const indexFile = path.join(clientDir, 'index.html');
  if (!fs.existsSync(indexFile)) return router;
  const indexHtml = fs.readFileSync(indexFile, 'utf8');

  router.use(
    express.static(clientDir, {
      index: false,
      setHeaders(res, file) {
        const hashed = /-[A-Z0-9]{8}\.(js|css)$/.test(file) || file.includes(`${path.sep}media${path.sep}`);
        res.setHeader('Cache-Control', hashed ? 'public, max-age=31536000, immutable' : 'no-cache');
      },
    }),
  );
  router.get(/^(?!\/api\/).*/, (_req, res) => {
    const nonce = res.locals['cspNonce'] as string;
    res.setHeader('Cache-Control', 'no-store');
    res.type('html').send(indexHtml.replace('<app-root', `<app-root ngCspNonce="${nonce}"`));
  });
  return router;
}

/** A fresh base64 nonce for this response's CSP. */
export function newNonce(): string {
  return crypto.randomBytes(16).toString('base64');
}
