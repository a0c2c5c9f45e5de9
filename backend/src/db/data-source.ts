import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { env } from '../config/env';
import { SnakeNamingStrategy } from './naming-strategy';
import { entities } from './entities';
import { migrations } from './migrations';

/** Builds the application's one DataSource (MariaDB through mysql2). Times are read and written in UTC. */
export function createDataSource(overrides: { database?: string; port?: number; poolSize?: number } = {}): DataSource {
  const e = env();
  return new DataSource({
    type: 'mariadb',
    host: e.DB_HOST,
    port: overrides.port ?? e.DB_PORT,
    username: e.DB_USER,
    password: e.DB_PASSWORD,
    database: overrides.database ?? e.DB_NAME,
    timezone: 'Z',
    charset: 'utf8mb4_unicode_ci',
    entities,
    migrations,
    migrationsTableName: 'schema_migration',
    synchronize: false,
    namingStrategy: new SnakeNamingStrategy(),
    poolSize: overrides.poolSize ?? e.DB_POOL_SIZE,
    extra: { connectTimeout: 5000, waitForConnections: true, queueLimit: 200 },
    logging: ['error'],
  });
}
