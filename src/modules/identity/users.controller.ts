import { Controller, Get, HttpCode, Post } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { UuidParam, ZBody } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from './actor';
import { CreateUser } from './users.dto';
import { UsersRepository } from './users.repository';
import { UsersService } from './users.service';
import { Me, User, UserList, ZResponse } from '../../common/openapi/responses';

@ApiTags('people')
@ApiSecurity('user')
@Controller('api')
export class UsersController {
  constructor(
    private readonly users: UsersRepository,
    private readonly service: UsersService,
  ) {}

  @Get('me')
  @ZResponse(Me)
  @ApiOperation({ summary: 'Who is calling, and their shop' })
  async me(@CurrentActor() actor: Actor) {
    return { user: actor, shop: await this.users.shop(actor.shopId) };
  }

  @Get('users')
  @ZResponse(UserList)
  @ApiOperation({ summary: 'Everyone in the caller’s shop (to assign technicians, to filter the board)' })
  async list(@CurrentActor() actor: Actor) {
    return { items: await this.users.listInShop(actor.shopId) };
  }

  @Post('users')
  @ZResponse(User, 201)
  @ApiOperation({ summary: 'Admin only: add a person to the shop with a role and an initial password (NIST SP 800-63B §5.1.1.2 rules)' })
  create(@CurrentActor() actor: Actor, @ZBody(CreateUser) body: CreateUser) {
    return this.service.create(actor, body);
  }

  @Post('users/:id/deactivate')
  @ZResponse(User)
  @HttpCode(200)
  @ApiOperation({ summary: 'Admin only: deactivate a person; their sessions and tokens end at once, their past work keeps their name' })
  deactivate(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    return this.service.deactivate(actor, id);
  }
}
