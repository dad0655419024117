// One "app server" for the two-server reminder test: a separate Node process with its own database
// pool that runs the reminder job once, at an agreed instant, and prints the run's counts as JSON.
// Usage: node --conditions=react-server --import tsx tests/support/reminder-server.ts <startAtMs>
import { runReminderJob } from '@/lib/jobs/reminders';
import { closeDb } from '@/db/knex';

async function main(): Promise<void> {
  const startAt = Number(process.argv[2]);
  await new Promise((r) => setTimeout(r, Math.max(0, startAt - Date.now())));
  const result = await runReminderJob();
  process.stdout.write(`${JSON.stringify(result)}\n`);
  await closeDb();
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
