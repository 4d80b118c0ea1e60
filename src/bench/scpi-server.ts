import { createServer, type Server, type Socket } from 'node:net';
import { lineCap } from './transport.js';

/** What the server answers to one command line: text (a newline is added), bytes as they are, or nothing. */
export type ScpiAnswer = string | Uint8Array | null;

export interface ScpiServer {
  readonly port: number;
  readonly host: string;
  close(): Promise<void>;
}

/**
 * A raw-socket SCPI listener on a loopback address: one command per line,
 * answered by `answer`. Used by the simulated bench (`instruments
 * --simulate`); it never reads files or runs anything a peer sends.
 */
export async function startScpiServer(answer: (command: string) => ScpiAnswer, options: { port?: number; host?: string } = {}): Promise<ScpiServer> {
  const host = options.host ?? '127.0.0.1';
  const sockets = new Set<Socket>();
  const server: Server = createServer((socket) => {
    sockets.add(socket);
    socket.setNoDelay(true);
    let pending = '';
    socket.on('data', (chunk) => {
      pending += chunk.toString('latin1');
      // A peer flooding without a newline is cut off, as an instrument would.
      if (pending.length > lineCap) {
        socket.destroy();
        return;
      }
      let end = pending.indexOf('\n');
      while (end >= 0) {
        const line = pending.slice(0, end).replace(/\r$/, '').trim();
        pending = pending.slice(end + 1);
        if (line !== '') {
          const reply = answer(line);
          if (typeof reply === 'string') socket.write(`${reply}\n`);
          else if (reply) socket.write(reply);
        }
        end = pending.indexOf('\n');
      }
    });
    socket.on('error', () => socket.destroy());
    socket.on('close', () => sockets.delete(socket));
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : 0;
  return {
    port,
    host,
    close: () =>
      new Promise<void>((resolve) => {
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
  };
}
