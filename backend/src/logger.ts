/** A small leveled logger on stdout/stderr (one line per event; never logs request bodies or passwords). */
const levels = { silent: 0, error: 1, info: 2, debug: 3 } as const;
let level: keyof typeof levels = 'info';

export const logger = {
  setLevel(l: keyof typeof levels) {
    level = l;
  },
  error(msg: string) {
    if (levels[level] >= 1) console.error(`${new Date().toISOString()} ERROR ${msg}`);
  },
  info(msg: string) {
    if (levels[level] >= 2) console.log(`${new Date().toISOString()} INFO ${msg}`);
  },
  debug(msg: string) {
    if (levels[level] >= 3) console.log(`${new Date().toISOString()} DEBUG ${msg}`);
  },
};
