/** The thread that takes a first look at a large data file (inspect-data-thread.ts starts it). */
import { parentPort, workerData } from 'node:worker_threads';
import { inspectData } from './inspect-data.js';

const { fileName, bytes } = workerData as { fileName: string; bytes: Uint8Array };
parentPort?.postMessage(await inspectData(fileName, bytes));
