import { Body, Controller, forwardRef, Get, Inject, Post, Req, Res } from '@nestjs/common';
import type { Response } from 'express';
import { z } from 'zod';
import { ApiBody, ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { openApiSchema, UuidParam, ZQuery } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import type { RequestWithCredential } from '../identity/actor.guard';
import { ChecksSessionItself } from '../auth/session-cache';
import { SESSION_COOKIE } from '../auth/credentials';
import { DiagnosisService } from '../diagnosis/diagnosis.service';
import { apiDiagnosisView } from '../diagnosis/diagnosis.view';
import { ListMeasurements, MeasurementBody, RecordOptions } from './measurements.dto';
import { MeasurementsService } from './measurements.service';
import { MeasurementAnswer, MeasurementList, ZResponse } from '../../common/openapi/responses';

/** The route's own parameter pipes, asked beforehand (see ChecksSessionItself). */
const reachesHandler = (req: { params: Record<string, unknown>; query: unknown }) => z.uuid().safeParse(req.params.id).success && RecordOptions.safeParse(req.query).success;

@ApiTags('measurements')
@ApiSecurity('user')
@Controller('api/repair-orders/:id/measurements')
export class MeasurementsController {
  constructor(
    private readonly service: MeasurementsService,
    @Inject(forwardRef(() => DiagnosisService)) private readonly diagnoses: DiagnosisService,
  ) {}

  @Post()
  @ZResponse(MeasurementAnswer, 201)
  @ApiOperation({
    summary: 'Record a reading, or a batch of readings stored all-or-nothing',
    description:
      'A correction is a new reading with `supersedes` naming the one it replaces; nothing is edited or deleted. ' +
      'With `diagnosis=true` the answer also carries `diagnoses`: for each circuit the readings are on, the same ' +
      'body as GET …/circuits/{circuitId}/diagnosis, recomputed after these readings were stored (one request per reading on a tablet). ' +
      'The readings are stored first: should the diagnosis then fail (the database gone for a moment), the answer is an error yet ' +
      'the readings are kept, and re-sending them with the same `clientKey` answers with them and the diagnosis.',
  })
  @ApiBody({ schema: openApiSchema(MeasurementBody) })
  @ChecksSessionItself(reachesHandler)
  async record(
    @CurrentActor() caller: Actor,
    @UuidParam('id') id: string,
    @ZQuery(RecordOptions) options: RecordOptions,
    @Body() body: unknown,
    @Req() req: RequestWithCredential,
    @Res({ passthrough: true }) res: Response,
  ) {
    const credential = req.credential!;
    const signIn = { signInId: credential.signInId, pending: req.pendingSession, path: credential.via === 'bearer' ? 'headers.authorization' : `cookies.${SESSION_COOKIE}` };
    const { replayed, result, circuits, highVoltageSystem, actor, history } = await this.service.record(caller, id, body, signIn, options.diagnosis);
    // A re-sent reading (same clientKey) is answered with what was stored, as 200 rather than 201.
    if (replayed) res.status(200);
    if (!options.diagnosis) return result;
    const diagnoses = [];
    for (const circuit of circuits) {
      const { tree, diagnosis } = await this.diagnoses.ofCircuit(actor, id, circuit, {}, history ?? undefined);
      diagnoses.push({ circuitId: circuit.id, ...apiDiagnosisView(tree, diagnosis, { sensor: circuit.sensor, highVoltageSystem }) });
    }
    return { ...(result as object), diagnoses };
  }

  @Get()
  @ZResponse(MeasurementList)
  @ApiOperation({ summary: 'Readings of a repair order in the order taken; corrected ones only with includeSuperseded=true' })
  list(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @ZQuery(ListMeasurements) query: ListMeasurements) {
    return this.service.list(actor, id, query);
  }
}
