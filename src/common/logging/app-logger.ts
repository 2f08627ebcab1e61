import { ConsoleLogger, type LogLevel } from '@nestjs/common';
import { currentRequestId } from './request-context';

const LEVELS: LogLevel[] = ['fatal', 'error', 'warn', 'log', 'debug', 'verbose'];

/** Nest's start-up chatter (one line per module and route): only worth reading when debugging. */
const START_UP_CONTEXTS = new Set(['InstanceLoader', 'RoutesResolver', 'RouterExplorer', 'NestFactory', 'NestApplication']);

/** The one logger: Nest's console logger with the request id in front of every line written inside a request. */
export class AppLogger extends ConsoleLogger {
  private readonly verboseStartUp: boolean;

  constructor(level: LogLevel) {
    super('tracebay', { logLevels: LEVELS.slice(0, LEVELS.indexOf(level) + 1), timestamp: false });
    this.verboseStartUp = LEVELS.indexOf(level) >= LEVELS.indexOf('debug');
  }

  override log(message: unknown, context?: string): void {
    if (!this.verboseStartUp && context && START_UP_CONTEXTS.has(context)) return;
    super.log(message, context);
  }

  protected override formatMessage(
    logLevel: LogLevel,
    message: unknown,
    pidMessage: string,
    formattedLogLevel: string,
    contextMessage: string,
    timestampDiff: string,
  ): string {
    const id = currentRequestId();
    const prefixed = id && typeof message === 'string' ? `[${id}] ${message}` : message;
    return super.formatMessage(logLevel, prefixed, pidMessage, formattedLogLevel, contextMessage, timestampDiff);
  }
}
