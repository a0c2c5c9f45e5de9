import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import type { DataSource } from 'typeorm';
import { MailAttachment, MailMessage } from '../db/entities/mail.entity';
import { logger } from '../logger';

const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;

function addresses(a: AddressObject | AddressObject[] | undefined): string {
  if (!a) return '';
  return (Array.isArray(a) ? a : [a]).map((x) => x.text).join(', ');
}

/**
 * The local mail service of development and tests: an SMTP server on loopback that stores every message
 * it receives (with attachments) in MariaDB, where the administrators' mail screen reads them.
 * Production does not run it; the app then sends through the hospital's relay.
 */
export async function startMailService(ds: DataSource, port: number, host = '127.0.0.1'): Promise<SMTPServer> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    size: MAX_MESSAGE_BYTES,
    banner: 'Plenum local mail service',
    logger: false,
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          await ds.transaction(async (m) => {
            const text = parsed.text ?? '';
            const msg = await m.getRepository(MailMessage).save(
              m.getRepository(MailMessage).create({
                mailFrom: addresses(parsed.from).slice(0, 500),
                mailTo: [addresses(parsed.to), addresses(parsed.cc)].filter(Boolean).join('; ').slice(0, 2000),
                subject: (parsed.subject ?? '(no subject)').slice(0, 500),
                textBody: text,
                htmlBody: typeof parsed.html === 'string' ? parsed.html : null,
                messageId: parsed.messageId?.slice(0, 300) ?? null,
                sizeBytes: Buffer.byteLength(text) + parsed.attachments.reduce((s, a) => s + a.size, 0),
              }),
            );
            for (const a of parsed.attachments) {
              await m.getRepository(MailAttachment).insert({
                mailMessageId: msg.id,
                filename: (a.filename ?? 'attachment').slice(0, 300),
                contentType: a.contentType.slice(0, 120),
                sizeBytes: a.size,
                content: a.content,
              });
            }
          });
          callback();
        })
        .catch((err: Error) => {
          logger.error(`mail service could not store a message: ${err.message}`);
          callback(new Error('451 message not stored, try again later'));
        });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  server.on('error', (err) => logger.error(`mail service: ${err.message}`));
  return server;
}

export function stopMailService(server: SMTPServer): Promise<void> {
  return new Promise((resolve) => server.close(() => resolve()));
}
