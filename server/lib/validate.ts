import type { z } from 'zod';

/** Validation happens once, at the edge: a route parses its input with the shared schema and gets typed data. */
export function parse<S extends z.ZodType>(schema: S, input: unknown): z.output<S> {
  return schema.parse(input);
}
