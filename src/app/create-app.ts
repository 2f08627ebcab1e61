import type { INestApplication } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import type { NestExpressApplication } from '@nestjs/platform-express';
import { DocumentBuilder, SwaggerModule } from '@nestjs/swagger';
import { withErrorResponses } from '../common/openapi/responses';
import helmet from 'helmet';
import { type NextFunction, type Request, type Response } from 'express';
import type { AppConfig } from '../config/config';
import type { OpenDatabase } from '../common/database/database.tokens';
import { AppLogger } from '../common/logging/app-logger';
import { requestContext } from '../common/logging/request-context';
import { currentRequestId } from '../common/logging/request-context';
import { AppModule } from './app.module';
import { noStoreOnApi } from './cache-control';

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

/**
 * Security headers on every answer (helmet). The pages load only same-origin ES modules and CSS from /assets, so
 * scripts and styles are 'self' only; style attributes stay allowed for the probability bars (a style attribute
 * cannot run script). Swagger UI at /api/docs inlines its own styles, so it gets a CSP of its own that allows them;
 * its scripts are still same-origin files. HSTS is sent only when cookies are marked Secure (TLS in front);
 * upgrade-insecure-requests is left out so a tablet on plain http in the shop still loads the assets.
 */
function securityHeaders(config: AppConfig) {
  const common = {
    defaultSrc: ["'self'"],
    baseUri: ["'self'"],
    objectSrc: ["'none'"],
    frameAncestors: ["'none'"],
    formAction: ["'self'"],
    imgSrc: ["'self'", 'data:'],
    fontSrc: ["'self'"],
    connectSrc: ["'self'"],
    scriptSrc: ["'self'"],
    scriptSrcAttr: ["'none'"],
    upgradeInsecureRequests: null,
  };
  const hsts = config.secureCookies ? { maxAge: 31_536_000, includeSubDomains: true } : false;
  const pages = fixedHeaders(helmet({ hsts, contentSecurityPolicy: { useDefaults: false, directives: { ...common, styleSrc: ["'self'"], styleSrcAttr: ["'unsafe-inline'"] } } }));
  const docs = fixedHeaders(helmet({ hsts, contentSecurityPolicy: { useDefaults: false, directives: { ...common, styleSrc: ["'self'", "'unsafe-inline'"] } } }));
  return (req: Request, res: Response, next: NextFunction) => {
    (req.path.startsWith('/api/docs') ? docs : pages)(res);
    next();
  };
}

/**
 * The headers a helmet middleware sets, worked out once: with every directive fixed they are the same on every
 * answer, and helmet would otherwise rebuild the policy text per request.
 */
function fixedHeaders(middleware: ReturnType<typeof helmet>): (res: Response) => void {
  const set: Array<[string, string]> = [];
  const removed: string[] = [];
  const recorder = { setHeader: (name: string, value: unknown) => set.push([name, String(value)]), removeHeader: (name: string) => removed.push(name) };
  let failed: unknown;
  middleware({} as Request, recorder as unknown as Response, (error?: unknown) => (failed = error));
  if (failed) throw failed;
  return (res) => {
    for (const name of removed) res.removeHeader(name);
    for (const [name, value] of set) res.setHeader(name, value);
  };
}

/** Builds the application (used by `main.ts` and by the HTTP tests), ready for `listen` or `init`. */
export async function createApp(config: AppConfig, database: OpenDatabase, logger = new AppLogger(config.logLevel)): Promise<INestApplication> {
  const app = await NestFactory.create<NestExpressApplication>(AppModule.with(config, database), {
    logger,
    bodyParser: false,
  });
  app.use(requestContext((line) => logger.log(line, 'http')));
  if (config.trustProxy) app.set('trust proxy', 1);
  app.use(securityHeaders(config));
  app.use(noStoreOnApi);
  // Bodies are read by the actor guard once the caller is known (src/common/http/read-body.ts), never before.
  app.use(bodyErrors);
  app.disable('x-powered-by');

  const document = SwaggerModule.createDocument(
    app,
    new DocumentBuilder()
      .setTitle('Tracebay API')
      .setDescription(
        'Repair orders, sensor-circuit readings, diagnosis and proof of repair. Sign in with POST /api/auth/sign-in and send the token as `Authorization: Bearer <token>` on every other call (health excepted).',
      )
      .setVersion('0.1.0')
      .addBearerAuth({ type: 'http', scheme: 'bearer', description: 'token from POST /api/auth/sign-in' }, 'user')
      .build(),
  );
  withErrorResponses(document);
  SwaggerModule.setup('api/docs', app, document, { jsonDocumentUrl: 'api/openapi.json', customSiteTitle: 'Tracebay API' });
  return app;
}
