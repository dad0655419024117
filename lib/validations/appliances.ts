// Appliance form and API body, and the appliance list query; shared by the office screens and
// /api/v1/appliances. Categories and fuels are the ones lib/limits judges against.
import { z } from 'zod';
import { APPLIANCE_CATEGORIES, FUEL_IDS } from '@/lib/limits/types';
import { listQuerySchema, optionalNumber, optionalText, requiredText } from './list-query';

export const FLUE_TYPES = ['open_flue', 'room_sealed', 'balanced', 'fan_assisted', 'flueless'] as const;
export const FLUE_TYPE_LABELS: Record<(typeof FLUE_TYPES)[number], string> = {
  open_flue: 'Open flue',
  room_sealed: 'Room-sealed',
  balanced: 'Balanced flue',
  fan_assisted: 'Fan-assisted',
  flueless: 'Flueless',
};

export const APPLIANCE_SORTS = ['site', 'category', 'fuel', 'location', 'make', 'updated'] as const;
export const applianceListQuerySchema = listQuerySchema(APPLIANCE_SORTS, {
  siteId: z.string().uuid('siteId must be an id').optional(),
  category: z.enum(APPLIANCE_CATEGORIES, { message: 'category is not known' }).optional(),
});
export type ApplianceListQuery = z.infer<typeof applianceListQuerySchema>;

export const applianceSchema = z.object({
  siteId: z.string({ message: 'Choose a site' }).uuid('Choose a site'),
  category: z.enum(APPLIANCE_CATEGORIES, { message: 'Choose a category' }),
  fuel: z.enum(FUEL_IDS, { message: 'Choose a fuel' }),
  flueType: z.enum(FLUE_TYPES, { message: 'Choose a flue arrangement' }),
  location: requiredText(120, 'Location'),
  make: optionalText(120, 'Make'),
  model: optionalText(120, 'Model'),
  serial: optionalText(120, 'Serial'),
  ratedInputKw: optionalNumber('Rated heat input (kW)', { min: 0.1, max: 2000 }),
  mfrRatioMax: optionalNumber('Manufacturer CO/CO2 ratio limit', { min: 0.0001, max: 0.1 }),
  mfrCoAirFreeMaxPpm: optionalNumber('Manufacturer air-free CO limit (ppm)', { min: 1, max: 10000 }),
  mfrCoMaxPpm: optionalNumber('Manufacturer CO limit (ppm)', { min: 1, max: 10000 }),
});
export type ApplianceInput = z.input<typeof applianceSchema>;
export type ApplianceData = z.output<typeof applianceSchema>;
