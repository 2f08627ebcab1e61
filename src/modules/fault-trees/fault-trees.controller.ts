import { Body, Controller, Get, Post, Res } from '@nestjs/common';
import { ApiBody, ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import type { Response } from 'express';
import { UuidParam } from '../../common/validation/zod-input';
import { TREE_LIMITS, treeLimitsTable } from '../../engine/diagnosis';
import { CurrentActor, type Actor } from '../identity/actor';
import { FaultTreeCatalog } from './fault-tree-catalog.service';
import { FaultTreesRepository } from './fault-trees.repository';
import { FaultTree, FaultTreeList, FaultTreeUpload, ZResponse } from '../../common/openapi/responses';

@ApiTags('fault trees')
@ApiSecurity('user')
@Controller('api/fault-trees')
export class FaultTreesController {
  constructor(
    private readonly catalog: FaultTreeCatalog,
    private readonly trees: FaultTreesRepository,
  ) {}

  @Get()
  @ZResponse(FaultTreeList)
  @ApiOperation({ summary: 'The built-in trees and every version of the shop’s own trees' })
  async list(@CurrentActor() actor: Actor) {
    return { builtIn: this.catalog.builtIns(), shop: await this.trees.listForShop(actor.shopId) };
  }

  @Post()
  @ZResponse(FaultTreeUpload, 201)
  @ApiOperation({
    summary: 'Upload a shop tree (foreman or admin): validated, stored as a new version; the same document again is the same version',
    description: `Errors name the JSON path inside the document, e.g. body.tests.3.outcomes.1.condition. A tree over a size limit is refused with a 400 whose finding code names the limit (tree.limit.<name>). Limits: ${treeLimitsTable()}.`,
  })
  @ApiBody({
    schema: {
      type: 'object',
      description: `a fault-tree document (format tracebay.fault-tree/1); see src/engine/trees for the built-in ones. Limits: ${treeLimitsTable()}.`,
      'x-tracebay-limits': Object.fromEntries(Object.entries(TREE_LIMITS).map(([name, l]) => [name, l.max])),
    } as Record<string, unknown>,
  })
  async upload(@CurrentActor() actor: Actor, @Body() body: unknown, @Res({ passthrough: true }) res: Response) {
    const result = await this.trees.transaction((tx) => this.catalog.upload(actor, body, tx));
    res.status(result.created ? 201 : 200);
    return result;
  }

  @Get(':treeRowId')
  @ZResponse(FaultTree)
  @ApiOperation({ summary: 'One stored tree version with its document' })
  async get(@CurrentActor() actor: Actor, @UuidParam('treeRowId') id: string) {
    const tree = await this.catalog.byStoredId(actor, id);
    return { id, treeId: tree.id, version: tree.version, circuitKind: tree.circuitKind, label: tree.title, document: tree.document };
  }
}
