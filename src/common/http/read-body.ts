/**
 * Request bodies are read only once the caller is known (or the route needs nobody): the global guard calls this
 * after authentication, so nobody signed out can make the service read (and hold) a large body.
 */
import { BadRequestException, PayloadTooLargeException } from '@nestjs/common';
import { json, raw, type Request, type Response } from 'express';
import { DomainException } from '../errors/domain.exception';
import { MAX_JSON_BODY_DEPTH, refuseDeepJson } from '../validation/json-depth';

/** Paths whose body is a file (a proof handed over for checking), read as bytes up to this size. */
const FILE_ROUTES = [{ path: /^\/api\/proofs\/verify\/?$/, types: ['application/pdf', 'application/octet-stream', 'multipart/form-data'], limit: '20mb' }];

type Parser = (req: Request, res: Response, next: (error?: unknown) => void) => void;
const parsers = new Map<string, Parser>();

function parserFor(key: string, make: () => Parser): Parser {
  let p = parsers.get(key);
  if (!p) parsers.set(key, (p = make()));
  return p;
}

function run(parser: Parser, req: Request, res: Response): Promise<void> {
  return new Promise((resolve, reject) => parser(req, res, (error?: unknown) => (error ? reject(error) : resolve())));
}

/** Reads the body as JSON (or bytes, on a file route), once; maps the parsers' failures to the house errors. */
export async function readBody(req: Request, res: Response, jsonLimit: string): Promise<void> {
  if ((req as Request & { _body?: boolean })._body || req.body !== undefined) return;
  try {
    const file = FILE_ROUTES.find((r) => r.path.test(req.path));
    if (file) await run(parserFor(`raw:${file.limit}`, () => raw({ type: file.types, limit: file.limit }) as Parser), req, res);
    await run(parserFor(`json:${jsonLimit}`, () => json({ limit: jsonLimit, strict: false, verify: refuseDeepJson }) as Parser), req, res);
  } catch (error) {
    const type = (error as { type?: string }).type;
    if (type === 'body.too_deep') {
      throw new DomainException(
        'invalid',
        'body.too_deep',
        `The request body nests objects and arrays more than ${MAX_JSON_BODY_DEPTH} levels deep (limit of JSON body depth: ${MAX_JSON_BODY_DEPTH}).`,
        [{ code: 'body.too_deep', path: 'body', message: `at most ${MAX_JSON_BODY_DEPTH} levels of nesting` }],
      );
    }
    if (type === 'entity.too.large') throw new PayloadTooLargeException('The request body is larger than this service accepts.', { cause: error });
    if (type === 'entity.parse.failed') throw new BadRequestException('The request body is not valid JSON.', { cause: error });
    throw new BadRequestException('The request body could not be read.', { cause: error });
  }
}
