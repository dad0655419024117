// Body of POST /api/v1/calculations/flue-gas: the analyseFlueGas input. zod checks the shape;
// lib/combustion checks the ranges and names the field it refuses.
import { z } from 'zod';
import { FUEL_IDS } from '@/lib/combustion';

const figure = (name: string) => z.number({ message: `${name} must be a number` }).nullable().optional();

export const flueGasBodySchema = z
  .object({
    fuel: z.enum(FUEL_IDS, { message: `fuel must be one of ${FUEL_IDS.join(', ')}` }),
    coPpm: z.number({ message: 'coPpm must be a number' }),
    co2Pct: figure('co2Pct'),
    o2Pct: figure('o2Pct'),
    flueTempC: figure('flueTempC'),
    airTempC: figure('airTempC'),
    co2MaxPct: figure('co2MaxPct'),
  })
  .strict();
export type FlueGasBody = z.infer<typeof flueGasBodySchema>;
