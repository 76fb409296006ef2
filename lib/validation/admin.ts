import { z } from "zod";

import { ROLES } from "@/lib/auth/roles";

export const changeRoleSchema = z.strictObject({
  userId: z.string().min(1, { error: "Choose a user." }).max(64),
  role: z.enum(ROLES, { error: "Choose one of the roles in the list." }),
});
