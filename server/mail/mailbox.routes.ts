import { Router } from 'express';
import type { MailboxMessage, MailboxMessageSummary } from '../../src/contracts/api';
import type { Db } from '../db/knex';
import type { MailboxRow } from '../db/rows';
import { NotFoundError } from '../errors';
import { requireRole } from '../http/access';
import { IdParam } from '../http/validate';

const summary = (r: MailboxRow): MailboxMessageSummary => ({
  id: r.id,
  to: r.to_address,
  from: r.from_address,
  subject: r.subject,
  receivedAt: r.received_at,
});

/** Demo-only: the owner reads what the fake SMTP receiver caught. Mounted only in demo mode. */
export function mailboxRoutes(db: Db): Router {
  const router = Router();

  router.get('/mailbox', requireRole('owner'), async (_req, res) => {
    const rows = await db<MailboxRow>('mailbox_messages').orderBy('id', 'desc').limit(200);
    res.json({ messages: rows.map(summary) });
  });

  router.get('/mailbox/:id', requireRole('owner'), async (req, res) => {
    const p = IdParam.safeParse(req.params);
    const row = p.success ? await db<MailboxRow>('mailbox_messages').where({ id: p.data.id }).first() : undefined;
    if (!row) throw new NotFoundError('Message');
    const message: MailboxMessage = { ...summary(row), text: row.text, html: row.html };
    res.json(message);
  });

  return router;
}
