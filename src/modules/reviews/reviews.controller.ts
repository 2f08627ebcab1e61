import { Controller, Get, Post } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { UuidParam, ZBody } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { RecordReview } from './reviews.dto';
import { ReviewsService } from './reviews.service';
import { Review, ReviewList, ZResponse } from '../../common/openapi/responses';

@ApiTags('reviews')
@ApiSecurity('user')
@Controller('api/repair-orders/:id/reviews')
export class ReviewsController {
  constructor(private readonly service: ReviewsService) {}

  @Post()
  @ZResponse(Review, 201)
  @ApiOperation({ summary: 'Foreman decision on a repaired order: approve, return with a comment, or withdraw an approval (append-only)' })
  record(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @ZBody(RecordReview) body: RecordReview) {
    return this.service.record(actor, id, body);
  }

  @Get()
  @ZResponse(ReviewList)
  @ApiOperation({ summary: 'All foreman decisions on a repair order, oldest first, and the latest' })
  list(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    return this.service.list(actor, id);
  }
}
