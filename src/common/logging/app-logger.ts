import { ConsoleLogger, type LogLevel } from '@nestjs/common';
import { currentRequestId } from './request-context';

const LEVELS: LogLevel[] = ['fatal', 'error', 'warn', 'log', 'debug', 'verbose'];

/** The one logger: Nest's console logger with the request id in front of every line written inside a request. */
export class AppLogger extends ConsoleLogger {
  constructor(level: LogLevel) {
    super('tracebay', { logLevels: LEVELS.slice(0, LEVELS.indexOf(level) + 1), timestamp: false });
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
