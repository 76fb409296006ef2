import { z } from "zod";

/** Query of GET /api/v1/photos/[id]/image: which copy of the photo to answer with. */
export const photoImageQuerySchema = z.object({
  variant: z
    .enum(["original", "view", "thumbnail"], { error: "variant is original, view or thumbnail." })
    .default("view"),
});
