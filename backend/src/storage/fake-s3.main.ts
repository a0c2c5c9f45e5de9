/**
 * A local S3-compatible server for development and tests (s3rver, an npm package), on loopback only,
 * so that the app uses the same AWS SDK code path as with a hosted bucket. scripts/start,
 * scripts/cluster and scripts/test start it; production points S3_* at a real bucket instead.
 *   S3_FAKE_PORT (default 4569), S3_FAKE_DIR (where the objects live), S3_BUCKET (created if missing)
 */
import { mkdirSync } from 'node:fs';
import S3rver from 's3rver';

const port = Number(process.env.S3_FAKE_PORT ?? 4569);
const directory = process.env.S3_FAKE_DIR ?? '.data/s3';
const bucket = process.env.S3_BUCKET ?? 'plenum-uploads';
mkdirSync(directory, { recursive: true });

const server = new S3rver({ port, address: '127.0.0.1', directory, silent: true, configureBuckets: [{ name: bucket }] });
await server.run();
console.log(`[plenum] local S3 store on http://127.0.0.1:${port} (bucket ${bucket}, files in ${directory})`);
const stop = () => {
  server.close().finally(() => process.exit(0));
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
