import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import { clock } from '../../shared/clock';

export type CapturedMail = {
  id: number;
  receivedAt: string;
  from: string;
  to: string[];
  /** The Message-ID header; the dev inbox matches it to the outbox row (shop, kind). */
  messageId: string | null;
  subject: string;
  text: string;
  html: string | null;
};

/**
 * A local SMTP server for development and tests: it accepts every message and keeps the
 * most recent ones in memory for the dev inbox. Never used in production.
 */
export class FakeSmtp {
  readonly mails: CapturedMail[] = [];
  private server: SMTPServer | null = null;
  private nextId = 1;

  constructor(
    readonly port: number,
    private readonly keep = 500,
  ) {}

  async start(): Promise<void> {
    if (this.server) return;
    const server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS'],
      logger: false,
      onData: (stream, session, callback) => {
        simpleParser(stream)
          .then((parsed) => {
            const to = session.envelope.rcptTo.map((r) => r.address.toLowerCase());
            this.mails.unshift({
              id: this.nextId++,
              receivedAt: clock.now().toISOString(),
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
              to,
              messageId: parsed.messageId ?? null,
              subject: parsed.subject ?? '',
              text: parsed.text ?? '',
              html: typeof parsed.html === 'string' ? parsed.html : null,
            });
            this.mails.length = Math.min(this.mails.length, this.keep);
            callback();
          })
          .catch((err: Error) => callback(err));
      },
    });
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(this.port, '127.0.0.1', () => resolve());
    });
    server.on('error', () => undefined);
    this.server = server;
  }

  async stop(): Promise<void> {
    const server = this.server;
    this.server = null;
    if (server) await new Promise<void>((resolve) => server.close(() => resolve()));
  }

  get running(): boolean {
    return this.server !== null;
  }
}
