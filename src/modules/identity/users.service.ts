import { Injectable } from '@nestjs/common';
import { ConflictException, DomainException, InvalidInputException, NotFoundException } from '../../common/errors/domain.exception';
import { checkPassword } from '../auth/password-rules';
import { hashPassword } from '../auth/secrets';
import type { Actor } from './actor';
import type { CreateUser } from './users.dto';
import { UsersRepository } from './users.repository';

/** Shop settings and people are the admin's: a foreman runs the work, a technician does it. */
function adminOnly(actor: Actor): void {
  if (actor.role !== 'admin') throw new DomainException('forbidden', 'users.admin_only', 'Only a shop admin adds or deactivates people.');
}

@Injectable()
export class UsersService {
  constructor(private readonly users: UsersRepository) {}

  async create(actor: Actor, input: CreateUser) {
    adminOnly(actor);
    const shop = await this.users.shop(actor.shopId);
    const findings = checkPassword(input.password, { email: input.email, name: input.name, shopName: shop.name }, 'body.password');
    if (findings.length > 0) throw new InvalidInputException(findings);
    if (await this.users.emailTaken(input.email)) {
      throw new ConflictException('user.email_taken', `The email ${input.email} already has an account.`, {}, [
        { code: 'user.email_taken', path: 'body.email', message: 'an email that has no account yet' },
      ]);
    }
    return this.users.create(actor.shopId, { name: input.name, email: input.email, role: input.role, passwordHash: await hashPassword(input.password) });
  }

  /** Deactivated people keep their name on past work; their sessions and tokens stop at once. */
  async deactivate(actor: Actor, id: string) {
    // Existence first: someone of another shop learns nothing, not even "not allowed".
    const user = await this.users.findInShop(actor.shopId, id);
    if (!user) throw new NotFoundException('user', id);
    adminOnly(actor);
    if (user.id === actor.userId) throw new ConflictException('user.self_deactivation', 'An admin cannot deactivate their own account.');
    return this.users.deactivate(id);
  }
}
