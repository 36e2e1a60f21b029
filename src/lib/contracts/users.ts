/** Schemas for creating people, shared by the API and the CLI. */
import { z } from 'zod';
import { ROLE_VALUES } from '../auth/permissions';

export const UserCreateSchema = z.object({
  email: z.email('email must be an e-mail address').max(320),
  name: z.string().trim().min(1, 'name is required').max(120),
  role: z.enum(ROLE_VALUES, `role must be one of ${ROLE_VALUES.join(', ')}`),
  password: z.string().min(10, 'password must have at least 10 characters').max(200),
  depots: z
    .union([
      z.array(z.string().max(16)),
      z
        .string()
        .max(400)
        .transform((s) => s.split(',').map((x) => x.trim()).filter(Boolean)),
    ])
    .optional(),
  allDepots: z.boolean().optional(),
});
export type UserCreate = z.infer<typeof UserCreateSchema>;
