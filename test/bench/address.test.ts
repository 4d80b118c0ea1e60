import { describe, expect, test } from 'vitest';
import { addressText, parseAddress } from '../../src/bench/address.js';

describe('instrument addresses (DESIGN §7a)', () => {
  test('tcp with and without a port; 5025 by convention (LXI, from memory)', () => {
    expect(parseAddress('tcp://192.0.2.10:5025')).toEqual({ kind: 'tcp', host: '192.0.2.10', port: 5025 });
    expect(parseAddress('tcp://bench-dmm')).toEqual({ kind: 'tcp', host: 'bench-dmm', port: 5025 });
    expect(parseAddress('tcp://[::1]:5555')).toEqual({ kind: 'tcp', host: '::1', port: 5555 });
    expect(addressText({ kind: 'tcp', host: '::1', port: 5555 })).toBe('tcp://[::1]:5555');
  });
  test('serial with a baud rate, usbtmc with its device', () => {
    expect(parseAddress('serial:///dev/ttyUSB0?baud=115200')).toEqual({ kind: 'serial', device: '/dev/ttyUSB0', baud: 115200 });
    expect(parseAddress('serial:///dev/ttyS1')).toEqual({ kind: 'serial', device: '/dev/ttyS1', baud: 9600 });
    expect(parseAddress('usbtmc:///dev/usbtmc0')).toEqual({ kind: 'usbtmc', device: '/dev/usbtmc0' });
  });
  test.each([
    '192.0.2.10:5025',
    'tcp://host:99999',
    'tcp://host:abc',
    'http://host',
    'serial://ttyUSB0',
    'serial:///dev/ttyUSB0?baud=fast',
    'serial:///dev/x?parity=odd',
    'usbtmc://usbtmc0',
    'tcp://',
  ])('%j is refused with a remedy', (text) => {
    const r = parseAddress(text);
    expect('problem' in r && r.problem).toMatch(/write|not|unknown/);
  });
});
