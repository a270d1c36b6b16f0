// Path parameters of the API's routes, parsed at the edge like every other input.
import { z } from 'zod';

/** The name of a record's id in a route's path (/api/…/:id). No request body has a field of this name, so the app tells a malformed address by it. */
export const ROUTE_ID_PARAM = 'id' as const;

export const idParamsSchema = z.object({ [ROUTE_ID_PARAM]: z.uuid('Not a valid id') });
