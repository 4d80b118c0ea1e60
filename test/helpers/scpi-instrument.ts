import { createServer, type Socket } from 'node:net';

/**
 * How the in-test instrument behaves to a query line: answer text (a newline is
 * added), raw bytes, or a misbehaviour. Written for the tests on its own (it
 * shares no code with src/bench) and served over a real loopback TCP socket.
 */
export type Behaviour =
  | { readonly kind: 'text'; readonly text: string; readonly delayMs?: number }
  | { readonly kind: 'bytes'; readonly bytes: Buffer }
  | { readonly kind: 'silent' }
  | { readonly kind: 'reset' }
  | { readonly kind: 'close-mid'; readonly partial: string }
  | { readonly kind: 'flood'; readonly bytes: number };

export interface TestInstrument {
  readonly port: number;
  /** Every command line received, in order. */
  readonly received: string[];
  /** Connections accepted so far. */
  connections: number;
  close(): Promise<void>;
}

export async function startTestInstrument(respond: (command: string) => Behaviour): Promise<TestInstrument> {
  const sockets = new Set<Socket>();
  const state: TestInstrument = { port: 0, received: [], connections: 0, close: async () => undefined };
  const server = createServer((socket) => {
    sockets.add(socket);
    state.connections++;
    socket.on('close', () => sockets.delete(socket));
    socket.on('error', () => undefined);
    let pending = '';
    socket.on('data', (chunk) => {
      pending += chunk.toString('latin1');
      for (let end = pending.indexOf('\n'); end >= 0; end = pending.indexOf('\n')) {
        const line = pending.slice(0, end).trim();
        pending = pending.slice(end + 1);
        state.received.push(line);
        const b = respond(line);
        if (b.kind === 'text') {
          const send = () => socket.writable && socket.write(`${b.text}\n`);
          if (b.delayMs) setTimeout(send, b.delayMs);
          else send();
        } else if (b.kind === 'bytes') socket.write(b.bytes);
        else if (b.kind === 'reset') socket.resetAndDestroy();
        else if (b.kind === 'close-mid') socket.end(b.partial);
        else if (b.kind === 'flood') {
          // Megabytes with no newline, written in chunks as a runaway instrument would.
          const chunkBytes = Buffer.alloc(64 * 1024, 0x37);
          let left = b.bytes;
          const pump = () => {
            while (left > 0 && socket.writable) {
              left -= chunkBytes.length;
              if (!socket.write(chunkBytes)) {
                socket.once('drain', pump);
                return;
              }
            }
          };
          pump();
        }
      }
    });
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const address = server.address();
  return Object.assign(state, {
    port: typeof address === 'object' && address ? address.port : 0,
    close: () =>
      new Promise<void>((resolve) => {
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
  });
}

/** A loopback port with nothing listening (bound, then released). */
export async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : 0;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}
