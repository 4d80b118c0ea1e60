/** Where an instrument is reached (DESIGN §7a). */
export type InstrumentAddress =
  | { readonly kind: 'tcp'; readonly host: string; readonly port: number }
  | { readonly kind: 'serial'; readonly device: string; readonly baud: number }
  | { readonly kind: 'usbtmc'; readonly device: string };

/** Raw-socket SCPI listens on 5025 by convention (LXI; from memory). */
export const defaultScpiPort = 5025;
const defaultBaud = 9600;

/**
 * Read `tcp://HOST[:PORT]`, `serial://DEVICE?baud=N` or `usbtmc://DEVICE`.
 * Returns a message instead of throwing, so the file loader can name the path.
 */
export function parseAddress(text: string): InstrumentAddress | { readonly problem: string } {
  const match = /^([a-z]+):\/\/(.*)$/i.exec(text.trim());
  if (!match)
    return { problem: `${JSON.stringify(text)} is not an address; write tcp://HOST[:PORT], serial:///dev/ttyUSB0?baud=9600 or usbtmc:///dev/usbtmc0` };
  const scheme = (match[1] ?? '').toLowerCase();
  const rest = match[2] ?? '';
  if (scheme === 'tcp') {
    // [v6]:port, host:port or host
    const v6 = /^\[([0-9a-f:.]+)\](?::(\d+))?\/?$/i.exec(rest);
    const plain = /^([^:/\s[\]]+)(?::(\d+))?\/?$/.exec(rest);
    const m = v6 ?? plain;
    if (!m) return { problem: `${JSON.stringify(text)}: write tcp://HOST or tcp://HOST:PORT (port ${defaultScpiPort} when left out)` };
    const port = m[2] === undefined ? defaultScpiPort : Number(m[2]);
    if (!Number.isInteger(port) || port < 1 || port > 65535) return { problem: `${JSON.stringify(text)}: port ${m[2]} is not 1…65535` };
    return { kind: 'tcp', host: m[1] ?? '', port };
  }
  if (scheme === 'serial') {
    const [device = '', query = ''] = rest.split('?', 2);
    if (!device.startsWith('/')) return { problem: `${JSON.stringify(text)}: write the device path, e.g. serial:///dev/ttyUSB0?baud=9600` };
    let baud = defaultBaud;
    for (const pair of query.split('&').filter(Boolean)) {
      const [key, value] = pair.split('=', 2);
      if (key !== 'baud') return { problem: `${JSON.stringify(text)}: unknown setting ${JSON.stringify(key)}; only baud=N is read` };
      baud = Number(value);
      if (!Number.isInteger(baud) || baud < 50 || baud > 4_000_000)
        return { problem: `${JSON.stringify(text)}: baud ${JSON.stringify(value)} is not a baud rate (e.g. 9600, 115200)` };
    }
    return { kind: 'serial', device, baud };
  }
  if (scheme === 'usbtmc') {
    if (!rest.startsWith('/')) return { problem: `${JSON.stringify(text)}: write the device path, e.g. usbtmc:///dev/usbtmc0` };
    return { kind: 'usbtmc', device: rest };
  }
  return { problem: `${JSON.stringify(text)}: unknown scheme ${JSON.stringify(scheme)}; use tcp://, serial:// or usbtmc://` };
}

/** The address as shown to the user. */
export function addressText(a: InstrumentAddress): string {
  if (a.kind === 'tcp') return `tcp://${a.host.includes(':') ? `[${a.host}]` : a.host}:${a.port}`;
  if (a.kind === 'serial') return `serial://${a.device}?baud=${a.baud}`;
  return `usbtmc://${a.device}`;
}
