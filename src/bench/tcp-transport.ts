import { connect } from 'node:net';
import { addressText, type InstrumentAddress } from './address.js';
import { StreamTransport, formatMs } from './stream-transport.js';
import { errnoWords, TransportFailure } from './transport.js';

/** Open a raw SCPI socket (`tcp://HOST:PORT`), giving up after `timeoutMs`. */
export function openTcp(address: Extract<InstrumentAddress, { kind: 'tcp' }>, timeoutMs: number, signal?: AbortSignal): Promise<StreamTransport> {
  const where = addressText(address);
  return new Promise((resolve, reject) => {
    const socket = connect({ host: address.host, port: address.port });
    socket.setNoDelay(true);
    const done = (error: TransportFailure | null) => {
      clearTimeout(timer);
      signal?.removeEventListener('abort', onAbort);
      socket.off('error', onError);
      socket.off('connect', onConnect);
      if (error) {
        socket.destroy();
        reject(error);
      } else resolve(new StreamTransport(socket, where));
    };
    const onError = (error: Error) => done(new TransportFailure(errnoWords(error, where)));
    const onConnect = () => done(null);
    const onAbort = () => done(new TransportFailure('was cancelled'));
    const timer = setTimeout(() => done(new TransportFailure(`did not accept a connection at ${where} within ${formatMs(timeoutMs)}`)), timeoutMs);
    socket.once('error', onError);
    socket.once('connect', onConnect);
    signal?.addEventListener('abort', onAbort);
  });
}
