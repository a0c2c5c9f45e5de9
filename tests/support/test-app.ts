import 'reflect-metadata';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { randomBytes } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { parseEnv, setEnv } from '@backend/config/env';
import { createDataSource } from '@backend/db/data-source';
import { setDb } from '@backend/db/db';
import { createApp } from '@backend/app';
import { logger } from '@backend/logger';
import { Organisation } from '@backend/db/entities/organisation.entity';
import { Site } from '@backend/db/entities/site.entity';
import { User, UserRole, UserSite } from '@backend/db/entities/user.entity';
import { hashPassword } from '@backend/modules/auth/auth.service';
import type { Role } from '@common/api/roles';

export interface TestApp {
  baseUrl: string;
  ds: DataSource;
  close: () => Promise<void>;
}

/** The real app in-process on a free loopback port, against the test database of scripts/test. */
export async function startTestApp(overrides: Record<string, string> = {}): Promise<TestApp> {
  setEnv(parseEnv({ ...process.env, NODE_ENV: 'test', SERVE_FRONTEND: 'false', LOG_LEVEL: 'error', ...overrides }));
  logger.setLevel('error');
  const ds = createDataSource({ poolSize: 5 });
  await ds.initialize();
  setDb(ds);
  const { app, close } = await createApp();
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    ds,
    close: async () => {
      server.closeAllConnections();
      await new Promise<void>((r) => server.close(() => r()));
      await close();
      await ds.destroy();
    },
  };
}

export interface Res<T = any> {
  status: number;
  body: T;
  headers: Headers;
}

/** A browser-like client: keeps the session cookie and sends the CSRF token on state-changing calls. */
export class Client {
  cookies = new Map<string, string>();
  csrf: string | undefined;
  constructor(readonly baseUrl: string) {}

  private cookieHeader(): string {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  }

  async request<T = any>(method: string, path: string, body?: unknown, opts: { csrf?: boolean; headers?: Record<string, string> } = {}): Promise<Res<T>> {
    const headers: Record<string, string> = { ...(opts.headers ?? {}) };
    if (this.cookies.size) headers.cookie = this.cookieHeader();
    if (body !== undefined) headers['content-type'] = 'application/json';
    const stateChanging = !['GET', 'HEAD'].includes(method.toUpperCase());
    if (stateChanging && opts.csrf !== false && this.csrf) headers['x-csrf-token'] = this.csrf;
    const res = await fetch(this.baseUrl + path, {
      method,
      headers,
      body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body),
      redirect: 'manual',
    });
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const i = pair.indexOf('=');
      const name = pair.slice(0, i);
      const value = pair.slice(i + 1);
      if (/expires=Thu, 01 Jan 1970/i.test(c) || value === '') this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
    const text = await res.text();
    let parsed: unknown = text;
    try {
      parsed = text ? JSON.parse(text) : undefined;
    } catch {
      /* not JSON */
    }
    return { status: res.status, body: parsed as T, headers: res.headers };
  }

  get<T = any>(path: string) {
    return this.request<T>('GET', path);
  }
  post<T = any>(path: string, body?: unknown, opts?: { csrf?: boolean }) {
    return this.request<T>('POST', path, body ?? {}, opts);
  }
  put<T = any>(path: string, body?: unknown) {
    return this.request<T>('PUT', path, body ?? {});
  }
  patch<T = any>(path: string, body?: unknown) {
    return this.request<T>('PATCH', path, body ?? {});
  }
  delete<T = any>(path: string) {
    return this.request<T>('DELETE', path);
  }

  async login(email: string, password: string): Promise<Res> {
    const res = await this.post('/api/auth/login', { email, password }, { csrf: false });
    if (res.status === 200) this.csrf = res.body.csrfToken;
    return res;
  }
}

export const PASSWORD = 'correct-horse-battery';
let hashed: string | undefined;

export function uniq(prefix = 't'): string {
  return `${prefix}-${randomBytes(4).toString('hex')}`;
}

export interface TestOrg {
  organisationId: number;
  siteIds: number[];
  /** e-mail per role; each user is granted every site of the organisation */
  users: Record<Role, string>;
  userIds: Record<Role, number>;
}

export const ALL_ROLES: Role[] = ['facilities_manager', 'ward_lead', 'purchasing_officer', 'biomedical_engineer', 'administrator'];

/** A fresh organisation with `sites` sites and one user per role (password PASSWORD). */
export async function createTestOrg(ds: DataSource, sites = 1): Promise<TestOrg> {
  hashed ??= await hashPassword(PASSWORD);
  const tag = uniq('org');
  const org = await ds.getRepository(Organisation).save({ name: `Test organisation ${tag}` });
  const siteIds: number[] = [];
  for (let i = 0; i < sites; i++) {
    const s = await ds.getRepository(Site).save(
      ds.getRepository(Site).create({
        organisationId: org.id,
        name: `Test site ${i + 1} ${tag}`,
        kind: 'hospital',
        address: '',
        timeZone: 'Europe/London',
        referenceCode: '15C',
        unitSystem: 'metric',
        altitudeM: 0,
        atmosphericBar: 1.01325,
        currency: 'GBP',
        cylinderColours: 'ISO32',
        storeTemperatureC: 15,
        beds: 100,
      }),
    );
    siteIds.push(s.id);
  }
  const users = {} as Record<Role, string>;
  const userIds = {} as Record<Role, number>;
  for (const role of ALL_ROLES) {
    const email = `${role}.${tag}@test.example`;
    const u = await ds.getRepository(User).save(
      ds.getRepository(User).create({
        organisationId: org.id,
        email,
        name: `${role} ${tag}`,
        passwordHash: hashed,
        active: true,
        failedLogins: 0,
        lockedUntil: null,
        passwordChangedAt: null,
      }),
    );
    await ds.getRepository(UserRole).insert({ userId: u.id, role });
    for (const siteId of siteIds) await ds.getRepository(UserSite).insert({ userId: u.id, siteId });
    users[role] = email;
    userIds[role] = u.id;
  }
  return { organisationId: org.id, siteIds, users, userIds };
}

export async function signedIn(app: TestApp, email: string): Promise<Client> {
  const c = new Client(app.baseUrl);
  const res = await c.login(email, PASSWORD);
  if (res.status !== 200) throw new Error(`sign-in failed for ${email}: ${res.status} ${JSON.stringify(res.body)}`);
  return c;
}
