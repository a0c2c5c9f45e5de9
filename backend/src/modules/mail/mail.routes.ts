import { z } from 'zod';
import { idParamSchema, mailListQuerySchema } from '@common/schemas/common.schema';
import type { Page } from '@common/schemas/common.schema';
import type { MailMessageView, MailSummary } from '@common/schemas/mail.schema';
import type { RouteDef } from '../../http/route';
import { validate } from '../../http/validate';
import { db } from '../../db/db';
import { MailAttachment, MailMessage } from '../../db/entities/mail.entity';
import { notFound } from '../../errors/app-error';

/**
 * The messages the local mail service received. Mail captured in development is not scoped to an
 * organisation (the service stores whatever arrives), so only administrators read it.
 */
export function mailRoutes(): RouteDef[] {
  return [
    {
      method: 'get',
      path: '/api/mail',
      access: ['administrator'],
      handler: async (req) => {
        const q = validate(mailListQuerySchema, req.query, 'query');
        const qb = db()
          .getRepository(MailMessage)
          .createQueryBuilder('m')
          .select(['m.id', 'm.receivedAt', 'm.mailFrom', 'm.mailTo', 'm.subject', 'm.sizeBytes']);
        if (q.q) qb.where('(m.subject LIKE :q OR m.mail_to LIKE :q OR m.mail_from LIKE :q)', { q: `%${q.q}%` });
        const sortable = new Map<typeof q.sort, string>([
          ['receivedAt', 'm.received_at'],
          ['subject', 'm.subject'],
          ['to', 'm.mail_to'],
          ['from', 'm.mail_from'],
        ]);
        const col = q.sort ? sortable.get(q.sort) : undefined;
        if (col) qb.orderBy(col, q.dir === 'desc' ? 'DESC' : 'ASC').addOrderBy('m.id', 'DESC');
        else qb.orderBy('m.id', 'DESC');
        qb.skip((q.page - 1) * q.pageSize).take(q.pageSize);
        const [rows, total] = await qb.getManyAndCount();
        const counts: { id: number; n: string }[] = rows.length
          ? await db().query(
              `SELECT mail_message_id AS id, COUNT(*) AS n FROM mail_attachment WHERE mail_message_id IN (${rows.map(() => '?').join(',')}) GROUP BY mail_message_id`,
              rows.map((r) => r.id),
            )
          : [];
        return {
          items: rows.map((r) => ({
            id: r.id,
            receivedAt: r.receivedAt.toISOString(),
            from: r.mailFrom,
            to: r.mailTo,
            subject: r.subject,
            sizeBytes: r.sizeBytes,
            attachments: Number(counts.find((c) => Number(c.id) === r.id)?.n ?? 0),
          })),
          total,
          page: q.page,
          pageSize: q.pageSize,
        } satisfies Page<MailSummary>;
      },
    },
    {
      method: 'get',
      path: '/api/mail/:id',
      access: ['administrator'],
      handler: async (req) => {
        const { id } = validate(idParamSchema, req.params, 'address');
        const m = await db().getRepository(MailMessage).findOneBy({ id });
        if (!m) throw notFound('Message');
        const attachments = await db()
          .getRepository(MailAttachment)
          .find({ select: { id: true, filename: true, contentType: true, sizeBytes: true }, where: { mailMessageId: id } });
        return {
          id: m.id,
          receivedAt: m.receivedAt.toISOString(),
          from: m.mailFrom,
          to: m.mailTo,
          subject: m.subject,
          text: m.textBody,
          html: m.htmlBody,
          attachments: attachments.map((a) => ({ id: a.id, filename: a.filename, contentType: a.contentType, sizeBytes: a.sizeBytes })),
        } satisfies MailMessageView;
      },
    },
    {
      method: 'get',
      path: '/api/mail/:id/attachments/:attachmentId',
      access: ['administrator'],
      handler: async (req, res) => {
        const p = validate(z.object({ id: z.coerce.number().int().positive(), attachmentId: z.coerce.number().int().positive() }), req.params, 'address');
        const a = await db().getRepository(MailAttachment).findOneBy({ id: p.attachmentId, mailMessageId: p.id });
        if (!a) throw notFound('Attachment');
        res.setHeader('Content-Type', a.contentType);
        res.setHeader('Content-Disposition', `attachment; filename="${a.filename.replace(/[^\w.\- ]/g, '_')}"`);
        res.setHeader('X-Content-Type-Options', 'nosniff');
        res.send(a.content);
        return undefined;
      },
    },
  ];
}
