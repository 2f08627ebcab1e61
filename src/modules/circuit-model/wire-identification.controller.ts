import { Controller, HttpCode, Post } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { ZBody } from '../../common/validation/zod-input';
import { roundProbabilities } from '../../common/round-probabilities';
import { IdentifyWiresBody } from './circuit-model.dto';
import { CircuitModelService } from './circuit-model.service';
import { WireRoles, ZResponse } from '../../common/openapi/responses';

@ApiTags('wires')
@ApiSecurity('user')
@Controller('api/wires')
export class WireIdentificationController {
  constructor(private readonly service: CircuitModelService) {}

  @Post('identify')
  @ZResponse(WireRoles)
  @HttpCode(200)
  @ApiOperation({
    summary: 'Tell the wires of an unplugged sensor connector apart from readings per cavity, with no diagram',
    description:
      'Per cavity: volts key on to battery negative (and the meter input resistance), optionally the same reading under another load, and ohms key off to battery negative ("open" for overload). ' +
      'Answers the most probable role of each cavity (reference, signal_pull_up, signal_pull_down — a signal pulled down or not biased —, ground, not_identified), each role’s probability, a reason, and the reading that would settle most doubt. ' +
      'Never put an ohmmeter on airbag circuits; back-probe without spreading terminals; the service information of the manufacturer takes precedence.',
  })
  identify(@ZBody(IdentifyWiresBody) body: IdentifyWiresBody) {
    return roundProbabilities(this.service.identifyWires(body));
  }
}
