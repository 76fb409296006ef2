import { z } from "zod";

import {
  pagingFields,
  queryDay,
  fromNotAfterTo,
  RANGE_ORDER_ISSUE,
  unknownQueryParameter,
} from "./query-fields";

/** Query string of GET /api/v1/observations; shared by the Logbook table. */
export const observationListQuerySchema = z
  .strictObject(
    {
      ...pagingFields({ defaultSize: 25, maxSize: 100 }),
      sort: z
        .enum(["observedAt:desc", "observedAt:asc"], { error: "sort is observedAt:desc or observedAt:asc." })
        .default("observedAt:desc"),
      from: queryDay.optional(),
      to: queryDay.optional(),
    },
    { error: unknownQueryParameter },
  )
  .refine(fromNotAfterTo, RANGE_ORDER_ISSUE);

export type ObservationListQueryInput = z.output<typeof observationListQuerySchema>;
