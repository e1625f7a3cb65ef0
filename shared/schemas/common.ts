import { z } from 'zod';

/** A finite number, with a message naming what was expected. */
export const finiteNumber = (what: string) =>
  z.number({ error: `${what} must be a number` }).refine(Number.isFinite, `${what} must be a finite number`);

export const positiveNumber = (what: string) => finiteNumber(what).refine((value) => value > 0, `${what} must be above zero`);

export const nonNegativeNumber = (what: string) => finiteNumber(what).refine((value) => value >= 0, `${what} must not be negative`);

export const shortText = (what: string, maximum = 200) =>
  z.string({ error: `${what} is required` }).trim().min(1, `${what} is required`).max(maximum, `${what} is longer than ${maximum} characters`);

export const optionalText = (what: string, maximum = 4000) =>
  z.string().trim().max(maximum, `${what} is longer than ${maximum} characters`).default('');

/** Server-side paging and sorting, from the query string. */
export const pageQuerySchema = z.object({
  page: z.coerce.number().int().min(1, 'page starts at 1').default(1),
  pageSize: z.coerce.number().int().min(1).max(500, 'pageSize is at most 500').default(50),
  sort: z.string().max(40).optional(),
  direction: z.enum(['asc', 'desc']).default('asc'),
});
export type PageQuery = z.infer<typeof pageQuerySchema>;

export interface Page<T> {
  items: T[];
  page: number;
  pageSize: number;
  total: number;
}
