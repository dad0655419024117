import 'server-only';
// The renewal reminder job: enqueue what is due, then deliver the outbox.
//
// Never twice, never dropped — how:
// 1. Enqueue: each reminder is a row keyed by (site, expiry date, offset). Running again the same
//    day inserts nothing new (insert … on conflict ignore), so a second run cannot add a duplicate.
// 2. Deliver: a run claims a row by flipping pending → sending in one conditional UPDATE, so two
//    runs at once never both own it. The row carries a fixed Message-ID, written before sending.
//    After the SMTP server accepts the message the row becomes sent.
// 3. Crash between "accepted" and "recorded as sent": the row stays in sending. Re-sending blindly
//    would duplicate; dropping it would lose a reminder that may never have gone. So a later run
//    takes rows stuck in sending (claimed longer ago than the lease) and asks the mail service
//    whether a message with that Message-ID was accepted: found → mark sent, no second send;
//    not found → the crash came before the hand-over, so it goes back to pending and is sent once.
//    Where the mail service offers no such look-up (a plain SMTP relay), the row is marked
//    uncertain and shown to the office on the renewals page rather than guessed either way.
import { randomUUID } from 'node:crypto';
import { sendMail, type OutgoingMail } from '@/lib/mail/transport';
import { env } from '@/lib/env';
import {
  claimOutboxRow, dueReminders, enqueueReminders, listOrganisationIds, listOutbox, markOutboxSent, markOutboxUncertain, releaseOutboxRow, type OutboxRow,
} from '@/db/reminders';

export type DeliveryLookup = (input: { messageId: string; to: string }) => Promise<boolean>;

/** Asks the local mail service (demo and tests) whether it holds a message with this Message-ID. */
export function mailFakeLookup(baseUrl: string): DeliveryLookup {
  return async ({ messageId, to }) => {
    const res = await fetch(`${baseUrl.replace(/\/+$/, '')}/messages?to=${encodeURIComponent(to)}`);
    if (!res.ok) throw new Error(`mail service answered ${res.status}`);
    const list = (await res.json()) as Array<{ messageId: string | null }>;
    const bare = (id: string | null) => (id ?? '').replace(/^<|>$/g, '');
    return list.some((m) => bare(m.messageId) === bare(messageId));
  };
}

export type ReminderRunResult = { enqueued: number; sent: number; recovered: number; requeued: number; uncertain: number; failed: number };

export async function runReminderJob(options: {
  now?: Date;
  send?: (mail: OutgoingMail) => Promise<unknown>;
  lookup?: DeliveryLookup | null;
  leaseMs?: number;
  /** Limit the run to one organisation (the office's "send due reminders now"). */
  organisationId?: string;
} = {}): Promise<ReminderRunResult> {
  const now = options.now ?? new Date();
  const e = env();
  const send = options.send ?? sendMail;
  const lookup = options.lookup === undefined ? (e.MAIL_FAKE_URL ? mailFakeLookup(e.MAIL_FAKE_URL) : null) : options.lookup;
  const leaseMs = options.leaseMs ?? 10 * 60_000;
  const result: ReminderRunResult = { enqueued: 0, sent: 0, recovered: 0, requeued: 0, uncertain: 0, failed: 0 };
  const domain = new URL(e.NEXTAUTH_URL).hostname;

  for (const organisationId of options.organisationId ? [options.organisationId] : await listOrganisationIds()) {
    result.enqueued += await enqueueReminders(await dueReminders(organisationId, { appUrl: e.NEXTAUTH_URL, domain, now }));
  }

  // Rows a dead run left in "sending".
  const stuck = await listOutbox({ status: 'sending', claimedBefore: new Date(now.getTime() - leaseMs).toISOString(), organisationId: options.organisationId });
  for (const row of stuck) {
    if (!row.claimToken) continue;
    if (!lookup) {
      await markOutboxUncertain(row.id, row.claimToken, 'A run stopped while sending; check with the recipient before sending again.');
      result.uncertain++;
      continue;
    }
    try {
      if (await lookup({ messageId: row.messageId, to: row.recipientEmail })) {
        await markOutboxSent(row.id, row.claimToken, now);
        result.recovered++;
      } else {
        await releaseOutboxRow(row.id, row.claimToken, 'A run stopped before the mail service took the message; sending again.');
        result.requeued++;
      }
    } catch {
      // The look-up itself failed: leave the row as it is for the next run.
    }
  }

  for (const row of await listOutbox({ status: 'pending', organisationId: options.organisationId })) {
    const outcome = await deliverOne(row, { send, now });
    if (outcome === 'sent') result.sent++;
    else if (outcome === 'failed') result.failed++;
  }
  return result;
}

/** Claim, send with the row's fixed Message-ID, record. Exported so tests can stop half-way. */
export async function deliverOne(row: OutboxRow, ctx: { send: (mail: OutgoingMail) => Promise<unknown>; now: Date; stopAfterSend?: boolean }): Promise<'sent' | 'skipped' | 'failed'> {
  const token = randomUUID();
  if (!(await claimOutboxRow(row.id, token, ctx.now))) return 'skipped';
  try {
    await ctx.send({ to: row.recipientEmail, subject: row.subject, text: row.bodyText, messageId: row.messageId });
  } catch (err) {
    await releaseOutboxRow(row.id, token, err instanceof Error ? err.message : String(err));
    return 'failed';
  }
  if (ctx.stopAfterSend) return 'sent';
  await markOutboxSent(row.id, token, ctx.now);
  return 'sent';
}
