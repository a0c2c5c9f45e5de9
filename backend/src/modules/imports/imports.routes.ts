import { mkdir, unlink } from 'node:fs/promises';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import type { NextFunction, Request, Response } from 'express';
import multer from 'multer';
import { idParamSchema } from '@common/schemas/common.schema';
import {
  exportQuerySchema,
  importCommitSchema,
  importOptionsSchema,
  importRemapSchema,
  importTemplateQuerySchema,
  IMPORT_COLUMNS,
  IMPORT_KINDS,
  IMPORT_KIND_LABELS,
} from '@common/schemas/usage.schema';
import type { Role } from '@common/api/roles';
import type { RouteDef } from '../../http/route';
import { actorOf } from '../../http/context';
import { validate } from '../../http/validate';
import { env } from '../../config/env';
import { AppError, badRequest } from '../../errors/app-error';
import * as svc from './import.service';
import { exportTable } from './exports';
import { uploadDir } from '../../storage/file-store';
import { getSiteFor } from '../sites/sites.service';
import type { ImportKinds } from '@common/schemas/usage.schema';

const id = (params: unknown) => validate(idParamSchema, params, 'address').id;
const FM: Role[] = ['facilities_manager'];

const FIELD_COUNT = 20;
const FIELD_MAX_KB = 64;

/**
 * multer to a local staging folder (never memory: files reach hundreds of MB) with the size limit and
 * clear messages; the service then checks the bytes and streams them into the shared file store.
 */
function uploadCsv(req: Request, res: Response, next: NextFunction): void {
  const dir = path.join(uploadDir(), 'incoming');
  const limitMb = env().UPLOAD_MAX_MB;
  const upload = multer({
    storage: multer.diskStorage({
      destination: (_req, _file, cb) => {
        mkdir(dir, { recursive: true }).then(
          () => cb(null, dir),
          (e: Error) => cb(e, dir),
        );
      },
      filename: (_req, _file, cb) => cb(null, `upload-${Date.now()}-${randomBytes(6).toString('hex')}.csv`),
    }),
    limits: { fileSize: svc.uploadLimitBytes(), files: 1, fields: FIELD_COUNT, fieldSize: FIELD_MAX_KB * 1024 },
  }).single('file');
  upload(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE')
        return next(
          new AppError(
            413,
            'too_large',
            `The file is larger than the ${limitMb} MB upload limit: nothing was stored. Split it (for example one file per month) and upload the parts.`,
            [{ path: 'file', message: `over ${limitMb} MB` }],
          ),
        );
      if (err.code === 'LIMIT_UNEXPECTED_FILE' || err.code === 'LIMIT_FILE_COUNT')
        return next(badRequest('Send one CSV file, in the form field “file”', [{ path: 'file', message: 'one file' }]));
      if (err.code === 'LIMIT_FIELD_VALUE')
        return next(
          badRequest(
            `The form field “${err.field ?? ''}” is too long (limit ${FIELD_MAX_KB} KB): nothing was stored. Send the file in the field “file” and only the short upload options beside it`,
            [{ path: err.field ?? 'file', message: `over ${FIELD_MAX_KB} KB` }],
          ),
        );
      if (err.code === 'LIMIT_FIELD_COUNT' || err.code === 'LIMIT_PART_COUNT')
        return next(
          badRequest(`The upload has too many fields (limit ${FIELD_COUNT}): nothing was stored. Send the file and the upload options only`, [
            { path: 'file', message: 'too many fields' },
          ]),
        );
      return next(badRequest(`The upload could not be read: ${err.message}. Nothing was stored`, [{ path: 'file', message: err.code }]));
    }
    // The multipart parser's own errors (a body cut short, a missing or broken boundary, a client gone
    // mid-upload) are plain errors without a system call; a failing disk is the server's fault (500).
    if (err instanceof Error && !(err as NodeJS.ErrnoException).syscall) {
      const cut = /unexpected end|request (aborted|closed)/i.test(err.message);
      return next(
        cut
          ? badRequest('The upload was cut off before its end, so it is incomplete: nothing was stored. Upload the file again', [
              { path: 'file', message: 'incomplete upload' },
            ])
          : badRequest(`The upload could not be read as a multipart form (${err.message}): nothing was stored. Upload the file from the form again`, [
              { path: 'file', message: 'not a multipart form' },
            ]),
      );
    }
    next(err);
  });
}

export function importRoutes(): RouteDef[] {
  return [
    {
      method: 'get',
      path: '/api/import-kinds',
      access: FM,
      handler: () =>
        ({
          maxMb: env().UPLOAD_MAX_MB,
          kinds: IMPORT_KINDS.map((kind) => ({ kind, label: IMPORT_KIND_LABELS[kind], columns: IMPORT_COLUMNS[kind] })),
        }) satisfies ImportKinds,
    },
    {
      method: 'post',
      path: '/api/sites/:id/imports',
      access: FM,
      before: [uploadCsv],
      handler: async (req) => {
        let options;
        try {
          options = validate(importOptionsSchema, req.body, 'upload');
        } catch (e) {
          if (req.file) await unlink(req.file.path).catch(() => undefined);
          throw e;
        }
        return svc.createImport(actorOf(req), id(req.params), req.file, options);
      },
    },
    { method: 'get', path: '/api/sites/:id/imports', access: FM, handler: (req) => svc.listImports(actorOf(req), id(req.params)) },
    {
      method: 'get',
      path: '/api/sites/:id/import-template',
      access: FM,
      handler: async (req, res) => {
        // Another organisation's site is 404 before the query is looked at.
        await getSiteFor(actorOf(req), id(req.params));
        const { kind } = validate(importTemplateQuerySchema, req.query, 'query');
        const csv = await svc.templateCsv(actorOf(req), id(req.params), kind);
        res.setHeader('Content-Type', 'text/csv; charset=utf-8');
        res.setHeader('Content-Disposition', `attachment; filename="plenum-template-${kind}.csv"`);
        res.send(csv);
        return undefined;
      },
    },
    {
      method: 'get',
      path: '/api/sites/:id/export',
      access: FM,
      handler: async (req, res) => {
        await getSiteFor(actorOf(req), id(req.params));
        const { table } = validate(exportQuerySchema, req.query, 'query');
        await exportTable(actorOf(req), id(req.params), table, res);
        return undefined;
      },
    },
    { method: 'get', path: '/api/imports/:id', access: FM, handler: (req) => svc.getImport(actorOf(req), id(req.params)) },
    {
      method: 'put',
      path: '/api/imports/:id/mapping',
      access: FM,
      handler: (req) => svc.remapImport(actorOf(req), id(req.params), validate(importRemapSchema, req.body, 'mapping')),
    },
    {
      method: 'post',
      path: '/api/imports/:id/commit',
      access: FM,
      handler: (req) => svc.commitImport(actorOf(req), id(req.params), validate(importCommitSchema, req.body, 'confirmation').confirmDuplicate),
    },
    { method: 'post', path: '/api/imports/:id/cancel', access: FM, handler: (req) => svc.cancelImport(actorOf(req), id(req.params)) },
    {
      method: 'get',
      path: '/api/imports/:id/errors.csv',
      access: FM,
      handler: async (req, res) => {
        const csv = await svc.errorsCsv(actorOf(req), id(req.params));
        res.setHeader('Content-Type', 'text/csv; charset=utf-8');
        res.setHeader('Content-Disposition', `attachment; filename="upload-${id(req.params)}-errors.csv"`);
        res.send(csv);
        return undefined;
      },
    },
  ];
}
