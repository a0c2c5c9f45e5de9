/**
 * Where uploaded files wait between the upload and their import. With several app processes behind a
 * load balancer the process that imports is not the one that received the upload, so the production
 * store is S3-compatible object storage (AWS SDK v3), reached by every process; `disk` is kept for a
 * single process. Files are streamed in and out, never held whole in memory.
 *
 * A stored file is named by a key (`uploads/<organisation>/<site>/<random>.csv`); the disk store maps it
 * under UPLOAD_DIR. Rows from before keys existed hold an absolute path, which the disk store still reads.
 */
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdir, rename, rm, unlink } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { pipeline } from 'node:stream/promises';
import type { Readable } from 'node:stream';
import { CreateBucketCommand, DeleteObjectCommand, GetObjectCommand, HeadBucketCommand, S3Client } from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import { env } from '../config/env';

export interface LocalCopy {
  path: string;
  /** Removes the local copy (a no-op when the store is the local disk itself). */
  release: () => Promise<void>;
}

export interface FileStore {
  readonly kind: 'disk' | 's3';
  /** Moves a finished local upload into the store under `key` (the local file is gone afterwards). */
  putFile(localPath: string, key: string): Promise<void>;
  /** A local file to read the stored bytes from, for as long as the caller needs it. */
  localCopy(key: string): Promise<LocalCopy>;
  remove(key: string): Promise<void>;
  /** Checks that the store answers (creating the bucket of a local fake store if it is missing). */
  ready(): Promise<void>;
}

export function uploadDir(): string {
  return env().UPLOAD_DIR || path.join(tmpdir(), 'plenum-uploads');
}

/** A new key for an upload of a site. */
export function uploadKey(organisationId: number, siteId: number): string {
  return `uploads/${organisationId}/${siteId}/${Date.now()}-${randomBytes(8).toString('hex')}.csv`;
}

const SAFE_KEY = /^uploads\/\d+\/\d+\/[\w.-]+$/;

class DiskStore implements FileStore {
  readonly kind = 'disk' as const;
  private pathOf(key: string): string {
    if (path.isAbsolute(key)) return key;
    if (!SAFE_KEY.test(key)) throw new Error(`Not a file-store key: ${key}`);
    return path.join(uploadDir(), key);
  }
  async putFile(localPath: string, key: string): Promise<void> {
    const target = this.pathOf(key);
    await mkdir(path.dirname(target), { recursive: true });
    try {
      await rename(localPath, target);
    } catch {
      await pipeline(createReadStream(localPath), createWriteStream(target));
      await unlink(localPath).catch(() => undefined);
    }
  }
  async localCopy(key: string): Promise<LocalCopy> {
    return { path: this.pathOf(key), release: async () => undefined };
  }
  async remove(key: string): Promise<void> {
    await unlink(this.pathOf(key)).catch(() => undefined);
  }
  async ready(): Promise<void> {
    await mkdir(uploadDir(), { recursive: true });
  }
}

class S3Store implements FileStore {
  readonly kind = 's3' as const;
  private readonly client: S3Client;
  private readonly bucket: string;
  constructor() {
    const e = env();
    this.bucket = e.S3_BUCKET;
    this.client = new S3Client({
      region: e.S3_REGION,
      endpoint: e.S3_ENDPOINT,
      forcePathStyle: e.S3_FORCE_PATH_STYLE,
      credentials: e.S3_ACCESS_KEY_ID && e.S3_SECRET_ACCESS_KEY ? { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY } : undefined,
    });
  }
  async putFile(localPath: string, key: string): Promise<void> {
    // Multipart upload from a file stream: memory stays at a few 5 MB parts whatever the file's size.
    await new Upload({
      client: this.client,
      params: { Bucket: this.bucket, Key: key, Body: createReadStream(localPath), ContentType: 'text/csv' },
      queueSize: 2,
      partSize: 5 * 1024 * 1024,
    }).done();
    await unlink(localPath).catch(() => undefined);
  }
  async localCopy(key: string): Promise<LocalCopy> {
    const dir = path.join(uploadDir(), 'fetched');
    await mkdir(dir, { recursive: true });
    const local = path.join(dir, `${randomBytes(8).toString('hex')}.csv`);
    const got = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }));
    try {
      await pipeline(got.Body as Readable, createWriteStream(local));
    } catch (e) {
      await rm(local, { force: true });
      throw e;
    }
    return { path: local, release: () => rm(local, { force: true }) };
  }
  async remove(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key })).catch(() => undefined);
  }
  async ready(): Promise<void> {
    try {
      await this.client.send(new HeadBucketCommand({ Bucket: this.bucket }));
    } catch (e) {
      if (env().NODE_ENV === 'production') throw e;
      // Development and tests: the local fake store starts empty.
      await this.client.send(new CreateBucketCommand({ Bucket: this.bucket }));
    }
  }
}

let store: FileStore | undefined;

/** The configured store (one per process). */
export function fileStore(): FileStore {
  store ??= env().FILE_STORE === 's3' ? new S3Store() : new DiskStore();
  return store;
}
