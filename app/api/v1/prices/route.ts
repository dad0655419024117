import { apiRoute, parseJson } from '@/lib/api/handler';
import { priceListSchema } from '@/lib/validations/prices';
import { getPriceList, savePriceList } from '@/db/prices';

export const runtime = 'nodejs';

// The organisation's price list and tax settings: the office reads and replaces it whole.
export const GET = apiRoute(['office'], async ({ user }) => getPriceList(user.organisationId));

export const PUT = apiRoute(['office'], async ({ req, user }) => {
  const data = await parseJson(req, priceListSchema);
  return savePriceList(user.organisationId, data);
});
