// The channel map of a schedule entry as it stands now: which channel is the hammer, which are
// accelerometers, with which sensitivity, DOF and sign. A snapshot of it is stored with each hit,
// so every number stays traceable to the calibration that produced it.
import { desc, eq, inArray } from 'drizzle-orm';
import { calibrationRecord, channel, kitItem } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { badRequest, HttpError } from '../errors.ts';
import { decodeRecording, RecordingError, type DecodedRecording } from './recording.ts';

export interface ChannelSnapshot {
  channel: number;
  role: 'force' | 'response';
  kitItemId: string;
  model: string;
  serial: string;
  /** mV/N for the hammer, mV/(m/s²) for accelerometers. */
  sensitivityBase: number;
  unit: 'N' | 'm/s²';
  /** The DOF this channel measured for this hit (the schedule's DOF for a roving channel). */
  dof: string;
  /** +1 when the sensor's axis points along the DOF direction, −1 against it. */
  sign: 1 | -1;
  calibration: { certificateRef: string; calibratedOn: string; dueOn: string } | null;
}

export async function channelMapFor(db: Db, campaignId: string, entry: { responseDof: string; excitationDof: string }): Promise<ChannelSnapshot[]> {
  const rows = await db
    .select({ ch: channel, item: kitItem })
    .from(channel)
    .innerJoin(kitItem, eq(kitItem.id, channel.kitItemId))
    .where(eq(channel.campaignId, campaignId))
    .orderBy(channel.channel);
  const hammers = rows.filter((r) => r.item.kind === 'hammer');
  const accels = rows.filter((r) => r.item.kind === 'accelerometer');
  if (hammers.length !== 1 || accels.length === 0) {
    throw new HttpError(
      409,
      'channel-map-incomplete',
      `Set up the channel map in Kit first: exactly one hammer channel and at least one accelerometer channel (now ${hammers.length} hammer and ${accels.length} accelerometer channels).`,
    );
  }
  const itemIds = rows.map((r) => r.item.id);
  const calibrations = await db
    .select()
    .from(calibrationRecord)
    .where(inArray(calibrationRecord.kitItemId, itemIds))
    .orderBy(desc(calibrationRecord.calibratedOn), desc(calibrationRecord.createdAt));
  const latest = new Map<string, (typeof calibrations)[number]>();
  for (const c of calibrations) if (!latest.has(c.kitItemId)) latest.set(c.kitItemId, c);
  return rows.map(({ ch, item }) => {
    const cal = latest.get(item.id);
    const isForce = item.kind === 'hammer';
    return {
      channel: ch.channel,
      role: isForce ? 'force' : 'response',
      kitItemId: item.id,
      model: item.model,
      serial: item.serial,
      // A triaxial sensor may have one sensitivity per axis (lab inventory); else the item's one.
      sensitivityBase: (ch.axis && item.axisSensitivities?.[ch.axis as 'X' | 'Y' | 'Z']) || item.sensitivityBase,
      unit: isForce ? 'N' : 'm/s²',
      dof: isForce ? entry.excitationDof : (ch.dof ?? entry.responseDof),
      sign: isForce ? 1 : ch.sign === -1 ? -1 : 1,
      calibration: cal ? { certificateRef: cal.certificateRef, calibratedOn: cal.calibratedOn, dueOn: cal.dueOn } : null,
    } satisfies ChannelSnapshot;
  });
}

/** Force channel first, then the responses in channel order: the order samples are stored in. */
export function storageOrder(map: ChannelSnapshot[]): ChannelSnapshot[] {
  return [...map.filter((c) => c.role === 'force'), ...map.filter((c) => c.role === 'response')];
}

/** How an uploaded recording's values are to be read (the multipart fields of an upload). */
export interface UploadReading {
  units: 'volts' | 'engineering';
  /** Hz, when the file carries no rate of its own. */
  sampleRateHz?: number;
  /** Front end's full scale in V, for integer PCM WAV. */
  fullScaleVolts: number;
}

/** The campaign's measurement ranges (acquisition settings): the hammer's in N, the accelerometers' in m/s². */
export interface ChannelRanges {
  forceRangeN: number;
  responseRangeMs2: number;
}

/**
 * A value more than this many times the channel's range cannot be a measurement (a front end clips
 * at its range; a factor of 1000 leaves room for a wrong range setting without letting an
 * overflowing value through). Common practice, not a standard.
 */
export const PHYSICAL_RANGE_FACTOR = 1000;
/** Whatever the range setting says, no hammer force or acceleration beyond 1e9 N or m/s² is taken (keeps float32 storage and squared sums finite). */
const ABSOLUTE_LIMIT = 1e9;

const fmtValue = (v: number) => (Number.isFinite(v) ? Number(v.toPrecision(4)).toString() : String(v));

/**
 * An uploaded file (hits or a background-noise recording) decoded and turned into engineering
 * units channel by channel: volts × 1000 ÷ sensitivity (mV per unit) × the channel's sign. The
 * file must have one column per channel of the map and the settings' sample rate, and every value
 * must stay within PHYSICAL_RANGE_FACTOR × the channel's range after the conversion; anything else
 * is refused with a 400 that says what was wrong (channel, sample, value) and that nothing was stored.
 */
export function uploadInEngineeringUnits(file: { originalname: string; mimetype: string; buffer: Buffer }, map: ChannelSnapshot[], reading: UploadReading, settingsRateHz: number, ranges: ChannelRanges): Float64Array[] {
  return decodedInEngineeringUnits(decodeUpload(file), map, reading, settingsRateHz, ranges);
}

/** Decodes an uploaded file; a malformed one is a 400 that says nothing was stored. */
export function decodeUpload(file: { originalname: string; mimetype: string; buffer: Buffer }): DecodedRecording {
  try {
    return decodeRecording(file.originalname, file.mimetype, file.buffer);
  } catch (err) {
    if (err instanceof RecordingError) throw new HttpError(400, 'bad-recording', `${err.message} Nothing was stored.`);
    throw err;
  }
}

/** The checks and unit conversion of uploadInEngineeringUnits on a recording already decoded (and perhaps resampled); its channels are converted in place and returned. */
export function decodedInEngineeringUnits(decoded: DecodedRecording, map: ChannelSnapshot[], reading: UploadReading, settingsRateHz: number, ranges: ChannelRanges): Float64Array[] {
  if (decoded.channels.length !== map.length) {
    throw badRequest(`The file has ${decoded.channels.length} channel${decoded.channels.length === 1 ? '' : 's'}; the channel map has ${map.length} (${map.map((c) => `ch${c.channel} ${c.role === 'force' ? 'hammer' : c.dof}`).join(', ')}). Nothing was stored.`);
  }
  const fs = decoded.sampleRateHz ?? reading.sampleRateHz ?? null;
  if (fs === null) throw badRequest('Unknown sample rate: the file has no time column or header rate; send the field sampleRateHz. Nothing was stored.');
  if (Math.abs(fs - settingsRateHz) > 1e-3 * settingsRateHz) throw badRequest(`The recording is sampled at ${+fs.toFixed(3)} Hz but the campaign's settings ask for ${settingsRateHz} Hz. Nothing was stored (a lead can allow resampling of uploads in the acquisition settings).`);
  const scale = decoded.fractionOfFullScale ? reading.fullScaleVolts : 1;
  return decoded.channels.map((ch, i) => {
    const c = map[i]!;
    const volts = reading.units === 'volts';
    const factor = (volts ? (scale * 1000) / c.sensitivityBase : 1) * c.sign;
    const range = c.role === 'force' ? ranges.forceRangeN : ranges.responseRangeMs2;
    const limit = Math.min(PHYSICAL_RANGE_FACTOR * range, ABSOLUTE_LIMIT);
    // In place: every caller hands over a recording it has just decoded and keeps no other use of it.
    const out = ch;
    for (let k = 0; k < ch.length; k++) {
      const v = ch[k]! * factor;
      if (!(Math.abs(v) <= limit)) {
        const what = `ch${c.channel} (${c.role === 'force' ? 'hammer' : `accelerometer at ${c.dof}`})`;
        const given = volts ? `${fmtValue(ch[k]! * scale)} V, which is ${fmtValue(v)} ${c.unit} with the sensitivity of ${c.sensitivityBase} mV/${c.unit}` : `${fmtValue(v)} ${c.unit}`;
        throw new HttpError(
          400,
          'value-out-of-range',
          `Column ${i + 1} of the file, ${what}, sample ${k + 1}: ${given} — beyond ${limit < PHYSICAL_RANGE_FACTOR * range ? `${limit} ${c.unit}, more than any measurement` : `${PHYSICAL_RANGE_FACTOR} × the campaign's ${c.role === 'force' ? 'force' : 'response'} range of ${range} ${c.unit}, so it cannot be a measurement`}. Check the units field and the file. Nothing was stored.`,
          { column: i + 1, channel: c.channel, sample: k + 1, value: Number.isFinite(ch[k]!) ? ch[k]! : String(ch[k]), limit, unit: c.unit },
        );
      }
      out[k] = v;
    }
    return out;
  });
}
