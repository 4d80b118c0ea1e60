// The worker thread of `readRestTwoThreads` (csv-part.ts): reads blocks of a CSV
// capture from the back and hands each block's column arrays over without copying them.
import { parentPort, workerData } from 'node:worker_threads';
import { type TwoThreadRequest, workerSide } from './csv-part.js';

workerSide(workerData as TwoThreadRequest, (message, transfer) => parentPort?.postMessage(message, transfer ?? []));
