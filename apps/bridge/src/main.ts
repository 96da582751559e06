// Command line of the watched-folder bridge:
//   pnpm bridge --url http://127.0.0.1:3000 --token rn_… --folder ./hits
// Stops on Ctrl-C (or SIGTERM); exits 2 when it cannot start and 3 when the server stops
// accepting its token.
import path from 'node:path';
import { parseArgs } from 'node:util';
import { z } from 'zod';
import { Bridge } from './bridge.ts';

const usage = `Usage: pnpm bridge --url <server> --token <rn_…> --folder <dir> [--settle-ms 2000] [--scan-ms 1000] [--units volts|engineering] [--full-scale-volts 1] [--sample-rate <Hz, for CSV without time>]
The token comes from your Account page in Resonote (or the RESONOTE_TOKEN environment variable).`;

const schema = z.strictObject({
  url: z.url('--url must be the server address, e.g. http://127.0.0.1:3000'),
  token: z.string().startsWith('rn_', '--token must be a personal API token (it starts with rn_)'),
  folder: z.string().min(1, '--folder is required'),
  settleMs: z.coerce.number().int().min(50).max(600_000).default(2000),
  scanMs: z.coerce.number().int().min(20).max(60_000).default(1000),
  units: z.enum(['volts', 'engineering']).default('volts'),
  fullScaleVolts: z.coerce.number().positive().max(1000).default(1),
  sampleRateHz: z.coerce.number().positive().optional(),
});

function fail(message: string): never {
  process.stderr.write(`${message}\n${usage}\n`);
  process.exit(2);
}

let values;
try {
  ({ values } = parseArgs({
    options: {
      url: { type: 'string' },
      token: { type: 'string' },
      folder: { type: 'string' },
      'settle-ms': { type: 'string' },
      'scan-ms': { type: 'string' },
      units: { type: 'string' },
      'full-scale-volts': { type: 'string' },
      'sample-rate': { type: 'string' },
      help: { type: 'boolean' },
    },
    // pnpm passes a lone "--" through to the script.
    args: process.argv.slice(2).filter((a) => a !== '--'),
  }));
} catch (err) {
  fail((err as Error).message);
}
if (values.help) {
  process.stdout.write(`${usage}\n`);
  process.exit(0);
}
const parsed = schema.safeParse({
  url: values.url,
  token: values.token ?? process.env.RESONOTE_TOKEN,
  folder: values.folder,
  settleMs: values['settle-ms'],
  scanMs: values['scan-ms'],
  units: values.units,
  fullScaleVolts: values['full-scale-volts'],
  sampleRateHz: values['sample-rate'],
});
if (!parsed.success) fail(parsed.error.issues.map((i) => i.message).join('; '));

// A package-manager script runs in the workspace root; a relative folder means the one the command was typed in.
const folder = path.resolve(process.env.INIT_CWD ?? process.cwd(), parsed.data.folder);
const stamp = () => new Date().toISOString().slice(11, 19);
const bridge = new Bridge({ ...parsed.data, folder, log: (line) => process.stdout.write(`[${stamp()}] ${line}\n`) });
const refused = await bridge.start();
if (refused) {
  process.stderr.write(`${refused.reason}\n`);
  process.exit(refused.code);
}
for (const signal of ['SIGINT', 'SIGTERM'] as const) process.on(signal, () => bridge.stop());
const exit = await bridge.done;
if (exit.code !== 0) process.stderr.write(`The bridge stopped: ${exit.reason}\n`);
process.exit(exit.code);
