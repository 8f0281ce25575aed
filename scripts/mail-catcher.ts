// A local SMTP server that accepts every message on 127.0.0.1 and keeps it as JSON under
// DATA_DIR/mail, for the demo and tests (MAIL_CATCHER=1). Mail never leaves the machine. Each
// message's recipients and links are also printed on this process's console (the operator's
// terminal), which is how a demo reads a verification, invitation or reset mail addressed to
// nobody real; the app's inbox page shows a signed-in person only mail to their own address.
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { getEnv } from '../lib/env';

const env = getEnv();
const dir = join(env.DATA_DIR, 'mail');
let seq = 0;

const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ['STARTTLS'],
  size: 5 * 1024 * 1024,
  onData(stream, session, done) {
    simpleParser(stream)
      .then(async (mail) => {
        await mkdir(dir, { recursive: true });
        const to = Array.isArray(mail.to) ? mail.to.flatMap((a) => a.value) : (mail.to?.value ?? []);
        const record = {
          id: `${Date.now()}-${++seq}`,
          receivedAt: new Date().toISOString(),
          from: mail.from?.text ?? '',
          to: to.map((a) => a.address ?? ''),
          // who the message was delivered to (the SMTP envelope), which is what the inbox filters on
          envelopeTo: session.envelope.rcptTo.map((r) => r.address),
          subject: mail.subject ?? '',
          text: mail.text ?? '',
          html: typeof mail.html === 'string' ? mail.html : '',
        };
        await writeFile(join(dir, `${record.id}.json`), JSON.stringify(record, null, 2));
        const links = record.text.match(/https?:\/\/\S+/g) ?? [];
        console.log(`[mail] to ${record.envelopeTo.join(', ')}: ${record.subject}${links.map((l) => `\n[mail]   ${l}`).join('')}`);
        done();
      })
      .catch((err: unknown) => done(err instanceof Error ? err : new Error(String(err))));
  },
});

server.on('error', (err) => console.error(`[mail] ${err.message}`));
server.listen(env.SMTP_PORT, '127.0.0.1', () => console.log(`[mail] catching on 127.0.0.1:${env.SMTP_PORT}, saving to ${dir}`));

const stop = () => server.close(() => process.exit(0));
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
