import 'server-only';
// Starts the app's scheduled jobs (croner) once per server process. Called from instrumentation.ts.
import { Cron } from 'croner';
import { runReminderJob } from './reminders';

const holder = globalThis as unknown as { __hearthmarkJobs?: Cron[] };

export function startScheduler(): void {
  if (holder.__hearthmarkJobs) return;
  const reminders = new Cron(
    // Every hour at :07, so a server that was down at the usual time catches up within the hour.
    '7 * * * *',
    { name: 'renewal-reminders', protect: true, catch: (err) => console.error('[jobs] renewal reminders failed', err) },
    async () => {
      const r = await runReminderJob();
      if (r.enqueued || r.sent || r.recovered || r.requeued || r.uncertain || r.failed) console.log('[jobs] renewal reminders', r);
    },
  );
  holder.__hearthmarkJobs = [reminders];
  // One run shortly after start: a restart never waits an hour to send what is due.
  setTimeout(() => void reminders.trigger(), 5_000).unref?.();
}
