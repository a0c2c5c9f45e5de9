/**
 * API tests run against the real MariaDB that scripts/test starts (a throw-away instance and database,
 * migrated before the run). Run outside scripts/test, they stop here with a clear message.
 */
export default async function setup(): Promise<void> {
  if (!process.env.PLENUM_TEST_DB) {
    throw new Error('API tests need the throw-away MariaDB started by scripts/test (PLENUM_TEST_DB is not set). Run scripts/test.');
  }
}
