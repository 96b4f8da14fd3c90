/**
 * `startServer` on PORT=0 (any free port, as `scripts/start.ts` allows): links the server writes
 * into e-mails and payment returns name the port it took, not port 0.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';
import { startServer, type RunningServer } from '../../server/main';

let running: RunningServer | null = null;
let dir = '';
afterEach(async () => {
  await running?.stop();
  running = null;
  fs.rmSync(dir, { recursive: true, force: true });
});

function configOn(extra: Record<string, string>) {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'trailframe-start-'));
  return loadConfig({
    PORT: '0',
    DB_FILE: path.join(dir, 'start.sqlite'),
    UPLOADS_DIR: path.join(dir, 'uploads'),
    DEMO_MODE: 'true',
    FAKE_SMTP_PORT: '0',
    DEMO_INBOX_PORT: '0',
    FAKE_PAYMENTS_PORT: '0',
    LOG_LEVEL: 'warn',
    ...extra,
  } as NodeJS.ProcessEnv);
}

describe('startServer on any free port', () => {
  it('names the port it took in its public address (payment returns and e-mail links), and answers there', async () => {
    running = await startServer(configOn({}));
    const port = Number(new URL(running.url).port);
    expect(port).toBeGreaterThan(0);
    expect(running.config.publicUrl).toBe(`http://localhost:${port}`);
    expect((await fetch(`${running.url}/api/health`)).status).toBe(200);
  });

  it('keeps a public address that was set (PUBLIC_URL)', async () => {
    running = await startServer(configOn({ PUBLIC_URL: 'https://clinic.example/' }));
    expect(running.config.publicUrl).toBe('https://clinic.example');
  });
});
