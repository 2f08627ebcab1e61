import { z } from 'zod';

export const SignInBody = z.strictObject({
  email: z.string().trim().min(3).max(254).describe('the account’s email address'),
  password: z.string().min(1).max(1024).describe('the account’s password'),
  as: z.enum(['token', 'session']).default('token').describe('token: answer a bearer token for API clients (default); session: set the pages’ session cookie instead'),
});
export type SignInBody = z.output<typeof SignInBody>;
