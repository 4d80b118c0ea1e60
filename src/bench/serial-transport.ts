import type { Duplex } from 'node:stream';
import { addressText, type InstrumentAddress } from './address.js';
import { StreamTransport, formatMs } from './stream-transport.js';
import { errnoWords, TransportFailure } from './transport.js';

/**
 * Open a serial instrument (`serial://DEVICE?baud=N`, 8 data bits, no parity,
 * one stop bit) through the `serialport` package, loaded only when a serial
 * instrument is used.
 */
export async function openSerial(address: Extract<InstrumentAddress, { kind: 'serial' }>, timeoutMs: number): Promise<StreamTransport> {
  const where = addressText(address);
  const { SerialPort } = await import('serialport');
  const port = new SerialPort({ path: address.device, baudRate: address.baud, autoOpen: false });
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new TransportFailure(`did not open ${where} within ${formatMs(timeoutMs)}`)), timeoutMs);
    port.open((error) => {
      clearTimeout(timer);
      if (error) reject(new TransportFailure(errnoWords(error, where).replace(/^failed at [^:]+: /, `cannot open ${where}: `)));
      else resolve();
    });
  });
  return new StreamTransport(port as unknown as Duplex, where);
}
