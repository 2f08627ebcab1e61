import type { INestApplication } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import type { NestExpressApplication } from '@nestjs/platform-express';
import { DocumentBuilder, SwaggerModule } from '@nestjs/swagger';
import { json, raw, type NextFunction, type Request, type Response } from 'express';
import type { AppConfig } from '../config/config';
import type { OpenDatabase } from '../common/database/database.tokens';
import { AppLogger } from '../common/logging/app-logger';
import { requestContext } from '../common/logging/request-context';
import { currentRequestId } from '../common/logging/request-context';
import { AppModule } from './app.module';

/** Body-parser failures (bad JSON, too large) answered in the same shape as every other error. */
function bodyErrors(error: { type?: string; status?: number }, _req: Request, res: Response, next: NextFunction): void {
  if (!error?.type) return next(error);
  const [status, code, message] =
    error.type === 'entity.too.large'
      ? [413, 'body.too_large', 'The request body is larger than this service accepts.']
      : error.type === 'entity.parse.failed'
        ? [400, 'body.malformed', 'The request body is not valid JSON.']
        : [error.status ?? 400, 'body.unreadable', 'The request body could not be read.'];
  res.status(status).json({ error: { code, message, requestId: currentRequestId() } });
}

/** Builds the application (used by `main.ts` and by the HTTP tests), ready for `listen` or `init`. */
export async function createApp(config: AppConfig, database: OpenDatabase, logger = new AppLogger(config.logLevel)): Promise<INestApplication> {
  const app = await NestFactory.create<NestExpressApplication>(AppModule.with(config, database), {
    logger,
    bodyParser: false,
  });
  app.use(requestContext((line) => logger.log(line, 'http')));
  app.use(json({ limit: config.bodyLimit, strict: false }));
  // A proof PDF posted for checking comes as it is.
  app.use('/api/proofs/verify', raw({ type: 'application/pdf', limit: '20mb' }));
  app.use(bodyErrors);
  app.disable('x-powered-by');
  app.enableShutdownHooks();

  const document = SwaggerModule.createDocument(
    app,
    new DocumentBuilder()
      .setTitle('Tracebay API')
      .setDescription(
        'Repair orders, sensor-circuit readings, diagnosis and proof of repair. Every call except health names its user in the `X-Tracebay-User` header.',
      )
      .setVersion('0.1.0')
      .addApiKey({ type: 'apiKey', in: 'header', name: 'X-Tracebay-User' }, 'user')
      .build(),
  );
  SwaggerModule.setup('api/docs', app, document, { jsonDocumentUrl: 'api/openapi.json', customSiteTitle: 'Tracebay API' });
  return app;
}
