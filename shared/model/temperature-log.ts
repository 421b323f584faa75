import { z } from 'zod';
import { ranged, text, uuid } from './common';

export const temperatureLogFields = z.object({
  siteId: uuid('siteId'),
  plotId: uuid('plotId'),
  depthCm: ranged(0, 200, 'cm', 'Depth'),
  source: text(255).default(''),
  series: z
    .object({
      t: z.array(z.string().datetime({ offset: true, message: 'Times must be ISO-8601 date-times' })).max(200000),
      tempC: z.array(ranged(-40, 70, '°C', 'Soil temperature')).max(200000),
    })
    .refine((s) => s.t.length === s.tempC.length, { message: 't and tempC must have the same length', path: ['tempC'] }),
});
