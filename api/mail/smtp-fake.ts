import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { Database } from '../db/client';
import { capturedMail } from '../db/schema/index';

/**
 * A local SMTP server for development and tests: accepts every message on 127.0.0.1 and stores it
 * in `captured_mail`, where the admin's "Outgoing mail" screen and the tests read it.
 */
export async function startSmtpFake(db: Database, port: number, host = '127.0.0.1') {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    banner: 'Descentry local mail catcher',
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          await db.insert(capturedMail).values({
            fromAddress: addressText(parsed.from),
            toAddress: addressText(parsed.to),
            subject: parsed.subject ?? '',
            textBody: parsed.text ?? '',
          });
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  const address = server.server.address();
  const boundPort = typeof address === 'object' && address ? address.port : port;
  return {
    port: boundPort,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

function addressText(address: AddressObject | AddressObject[] | undefined): string {
  if (!address) return '';
  return (Array.isArray(address) ? address : [address]).map((entry) => entry.text).join(', ');
}
