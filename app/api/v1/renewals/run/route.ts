import { apiRoute } from '@/lib/api/handler';
import { runReminderJob } from '@/lib/jobs/reminders';

export const runtime = 'nodejs';

// The scheduled job, run now for this organisation only; safe to repeat (see lib/jobs/reminders.ts).
export const POST = apiRoute(['office'], async ({ user }) => ({ result: await runReminderJob({ organisationId: user.organisationId }) }));
