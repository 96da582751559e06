// Worker-thread entry: registers the TypeScript loader, then runs the fit code. (Node 20 does not
// pass --import loaders on to worker threads.)
import { workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
await import(workerData.impl);
