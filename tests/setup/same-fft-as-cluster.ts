// In a cluster run the server processes use PFFFT (apps/api/src/server.ts, worker.ts; float32,
// docs/decisions/fast-fft.md). Reference values a test computes in its own process with
// packages/dsp, and the in-process app's results, then come from the same FFT as the answers
// they are compared with.
import { useFastFft } from '@resonote/dsp/fast-fft';

await useFastFft();
