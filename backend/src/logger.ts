/**
 * The app's logger: pino, one JSON line per event on stdout (what log collectors read). It never logs
 * request bodies, cookies or passwords; request lines (pino-http, see middleware/request-id.ts) carry
 * only the method, the path without its query, the status, the time taken and the request id.
 */
import { pino } from 'pino';

export type LogLevel = 'silent' | 'error' | 'info' | 'debug';

export const baseLogger = pino({
  level: 'info',
  base: undefined,
  timestamp: pino.stdTimeFunctions.isoTime,
  formatters: { level: (label) => ({ level: label }) },
});

export const logger = {
  setLevel(l: LogLevel) {
    baseLogger.level = l;
  },
  error(msg: string) {
    baseLogger.error(msg);
  },
  info(msg: string) {
    baseLogger.info(msg);
  },
  debug(msg: string) {
    baseLogger.debug(msg);
  },
};
