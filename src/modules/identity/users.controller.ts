import { Controller, Get } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { CurrentActor, type Actor } from './actor';
import { UsersRepository } from './users.repository';

@ApiTags('people')
@ApiSecurity('user')
@Controller('api')
export class UsersController {
  constructor(private readonly users: UsersRepository) {}

  @Get('me')
  @ApiOperation({ summary: 'Who is calling, and their shop' })
  async me(@CurrentActor() actor: Actor) {
    return { user: actor, shop: await this.users.shop(actor.shopId) };
  }

  @Get('users')
  @ApiOperation({ summary: 'Everyone in the caller’s shop (to assign technicians, to filter the board)' })
  async list(@CurrentActor() actor: Actor) {
    return { items: await this.users.listInShop(actor.shopId) };
  }
}
