import { z } from 'zod';
import { nameText } from '../../common/validation/domain-schemas';

export const CreateUser = z.strictObject({
  name: nameText(120).describe('the person’s name as shown on the pages and the proof'),
  email: z.string().trim().toLowerCase().pipe(z.email()).describe('sign-in email, unique across the installation'),
  role: z.enum(['technician', 'foreman', 'admin']),
  password: z.string().min(1).max(1024).describe('initial password; NIST SP 800-63B §5.1.1.2 rules apply (at least 12 characters, not a common one)'),
});
export type CreateUser = z.output<typeof CreateUser>;
