import { apiRoute, parseJson } from '@/lib/api/handler';
import { reminderSettingsSchema } from '@/lib/validations/renewals';
import { getReminderSettings, updateReminderSettings } from '@/db/reminders';
import { actorFrom } from '@/db/audit';

export const runtime = 'nodejs';

export const GET = apiRoute(['office'], async ({ user }) => ({ settings: await getReminderSettings(user.organisationId) }));

export const PUT = apiRoute(['office'], async ({ req, user }) => {
  const { offsetsDays } = await parseJson(req, reminderSettingsSchema);
  return { settings: await updateReminderSettings(actorFrom(user), offsetsDays) };
});
