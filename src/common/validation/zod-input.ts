/**
 * Zod schemas are the one source of request types, validation and the OpenAPI document. `@ZBody(schema)`
 * and `@ZQuery(schema)` validate the input (400 with every field path and what was expected) and register
 * the same schema with the OpenAPI document.
 */
import { Body, Param, PipeTransform, Query } from '@nestjs/common';
import { ApiBody, ApiParam, ApiQuery } from '@nestjs/swagger';
import { z, type ZodType } from 'zod';
import { issueCode } from '../../engine/request-schema';
import { InvalidInputException, type Finding } from '../errors/domain.exception';
import { plainMessage } from './plain-messages';

export function openApiSchema(schema: ZodType): Record<string, unknown> {
  const json = z.toJSONSchema(schema, { target: 'openapi-3.0', io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
  delete json.$schema;
  return json;
}

export function zodFindings(error: z.ZodError, root: string): Finding[] {
  return error.issues.map((issue) => ({
    code: issueCode(issue).startsWith('request.') ? issueCode(issue) : `${root}.${issue.code}`,
    path: [root, ...issue.path.map(String)].join('.'),
    message: plainMessage(issue),
  }));
}

export class ZodPipe<T extends ZodType> implements PipeTransform {
  constructor(
    private readonly schema: T,
    private readonly root: string,
  ) {}

  transform(value: unknown): z.output<T> {
    // reportInput: so that the plain message can say what came instead of what was expected.
    const parsed = this.schema.safeParse(value === undefined && this.root === 'body' ? null : value, { reportInput: true });
    if (!parsed.success) throw new InvalidInputException(zodFindings(parsed.error, this.root));
    return parsed.data;
  }
}

function methodDescriptor(target: object, key: string | symbol): PropertyDescriptor {
  return Object.getOwnPropertyDescriptor(target, key) as PropertyDescriptor;
}

/**
 * The parameter's declared type is a zod-inferred type, not a class: record it as a plain object so that no
 * reflection-based tool (the OpenAPI scanner) mistakes a same-named schema value for a model class.
 */
function plainParamType(target: object, key: string | symbol, index: number): void {
  const types = Reflect.getMetadata('design:paramtypes', target, key) as unknown[] | undefined;
  if (types && index < types.length) {
    types[index] = Object;
    Reflect.defineMetadata('design:paramtypes', types, target, key);
  }
}

export function ZBody(schema: ZodType, description?: string): ParameterDecorator {
  return (target, key, index) => {
    plainParamType(target, key!, index);
    Body(new ZodPipe(schema, 'body'))(target, key as string, index);
    ApiBody({ schema: openApiSchema(schema), description })(target, key as string, methodDescriptor(target, key!));
  };
}

export function ZQuery(schema: z.ZodObject): ParameterDecorator {
  return (target, key, index) => {
    plainParamType(target, key!, index);
    Query(new ZodPipe(schema, 'query'))(target, key as string, index);
    const json = openApiSchema(schema) as { properties?: Record<string, Record<string, unknown>>; required?: string[] };
    for (const [name, property] of Object.entries(json.properties ?? {})) {
      ApiQuery({ name, required: json.required?.includes(name) ?? false, schema: property })(
        target,
        key as string,
        methodDescriptor(target, key!),
      );
    }
  };
}

const Uuid = z.uuid({ message: 'a UUID' });

/** A UUID route parameter; anything else is a 404 would hide typos, so it is a 400 naming the parameter. */
export function UuidParam(name: string): ParameterDecorator {
  return (target, key, index) => {
    plainParamType(target, key!, index);
    Param(name, new ZodPipe(Uuid, `params.${name}`))(target, key as string, index);
    ApiParam({ name, schema: { type: 'string', format: 'uuid' } })(target, key as string, methodDescriptor(target, key!));
  };
}
