import { Encoder, Profile, type ActivityMesg, type DeviceInfoMesg, type EventMesg, type FileIdMesg, type LapMesg, type RecordMesg, type SessionMesg } from '@garmin/fitsdk';
import type { Recording, RecordingEvent } from './recording.js';

const FIT_EPOCH_S = 631065600;
const MESG = Profile.MesgNum;

type Field = number | string;

/**
 * Encodes a recording as a FIT activity file with the FIT SDK's encoder: file_id, device_info,
 * timer start/stop events, one record per sample (timestamp, power, cadence, speed, heart rate,
 * left_right_balance as the raw byte with bit 0x80 for the right share, torque effectiveness,
 * pedal smoothness), front/rear gear-change events with the packed gear data, laps, session and activity.
 *
 * FIT timestamps are whole seconds: sample times are rounded, so write 1 s (or coarser) recordings.
 * A NaN sample is left out of its record (the field reads as invalid), never written as 0.
 *
 * @example const bytes = writeFit(deviceView(ride, device).recording);
 */
export function writeFit(recording: Recording): Uint8Array {
  const { meta, time, columns: c } = recording;
  const fitTime = (t: number): number => Math.round(meta.startMs / 1000 + t) - FIT_EPOCH_S;
  const start = fitTime(0);
  const end = fitTime(meta.totalS);
  const encoder = new Encoder();
  const id = meta.device;
  const identity: FileIdMesg = {};
  put(identity, 'manufacturer', id.manufacturerId ?? 255);
  put(identity, 'product', id.productId);
  put(identity, 'serialNumber', id.serialNumber);
  const fileId: FileIdMesg = { type: 'activity', timeCreated: start, ...identity };
  encoder.writeMesg({ mesgNum: MESG.FILE_ID!, ...fileId });
  const info: DeviceInfoMesg = { timestamp: start, deviceIndex: 'creator', ...identity };
  put(info, 'softwareVersion', id.softwareVersion === undefined ? undefined : Number(id.softwareVersion));
  put(info, 'productName', id.product ?? id.label);
  encoder.writeMesg({ mesgNum: MESG.DEVICE_INFO!, ...info });

  const events = [...recording.events].sort((a, b) => a.t - b.t);
  let e = 0;
  const writeEventsUpTo = (t: number, inclusive: boolean): void => {
    while (e < events.length && (inclusive ? events[e]!.t <= t : events[e]!.t < t)) writeEvent(encoder, events[e++]!, fitTime);
  };
  const balanceByte = (b: number): number | undefined => {
    if (Number.isNaN(b)) return undefined;
    if (meta.balanceSide === 'right') return 0x80 | Math.round(b);
    if (meta.balanceSide === 'left') return 0x80 | Math.round(100 - b);
    return Math.round(b) & 0x7f;
  };
  for (let i = 0; i < time.length; i++) {
    writeEventsUpTo(time[i]!, false);
    const rec: RecordMesg = { timestamp: fitTime(time[i]!) };
    put(rec, 'power', c.power?.[i]);
    put(rec, 'cadence', c.cadence?.[i]);
    put(rec, 'speed', c.speed?.[i]);
    put(rec, 'heartRate', c.heartRate?.[i]);
    put(rec, 'leftRightBalance', c.balance && meta.balanceSide !== 'none' ? balanceByte(c.balance[i]!) : undefined);
    put(rec, 'leftTorqueEffectiveness', c.leftTorqueEffectiveness?.[i]);
    put(rec, 'rightTorqueEffectiveness', c.rightTorqueEffectiveness?.[i]);
    put(rec, 'leftPedalSmoothness', c.leftPedalSmoothness?.[i]);
    put(rec, 'rightPedalSmoothness', c.rightPedalSmoothness?.[i]);
    encoder.writeMesg({ mesgNum: MESG.RECORD!, ...rec });
  }
  writeEventsUpTo(Infinity, true);
  const laps = recording.events.filter((ev) => ev.kind === 'lap');
  const elapsed = end - start;
  const session: SessionMesg = {
    timestamp: end, startTime: start, totalElapsedTime: elapsed, totalTimerTime: elapsed - meta.pausedS,
    sport: 'cycling', event: 'session', eventType: 'stop', firstLapIndex: 0, numLaps: laps.length, messageIndex: 0,
  };
  encoder.writeMesg({ mesgNum: MESG.SESSION!, ...session });
  const activity: ActivityMesg = {
    timestamp: end, totalTimerTime: elapsed - meta.pausedS, numSessions: 1, type: 'manual', event: 'activity', eventType: 'stop',
  };
  encoder.writeMesg({ mesgNum: MESG.ACTIVITY!, ...activity });
  return encoder.close();
}

function put<T extends object>(target: T, key: keyof T & string, value: Field | undefined): void {
  if (value === undefined || (typeof value === 'number' && !Number.isFinite(value))) return;
  (target as Record<string, Field>)[key] = value;
}

function writeEventMesg(encoder: Encoder, mesg: EventMesg): void {
  encoder.writeMesg({ mesgNum: MESG.EVENT!, ...mesg });
}

function writeEvent(encoder: Encoder, ev: RecordingEvent, fitTime: (t: number) => number): void {
  const timestamp = fitTime(ev.t);
  switch (ev.kind) {
    case 'timer_start':
      writeEventMesg(encoder, { timestamp, event: 'timer', eventType: 'start' });
      return;
    case 'timer_stop':
      writeEventMesg(encoder, { timestamp, event: 'timer', eventType: 'stopAll' });
      return;
    case 'lap':
      const lap: LapMesg = {
        timestamp, startTime: fitTime(ev.startS), totalElapsedTime: ev.endS - ev.startS,
        totalTimerTime: ev.endS - ev.startS, event: 'lap', eventType: 'stop',
      };
      encoder.writeMesg({ mesgNum: MESG.LAP!, ...lap });
      return;
    case 'gear': {
      // Layout of the event data for gear changes: rear_gear_num | rear_gear << 8 | front_gear_num << 16 | front_gear << 24.
      const data = ((ev.rear?.index ?? 0) | ((ev.rear?.teeth ?? 0) << 8) | ((ev.front?.index ?? 0) << 16) | ((ev.front?.teeth ?? 0) << 24)) >>> 0;
      const event = ev.source === 'rear_gear_change' ? 'rearGearChange' : 'frontGearChange';
      writeEventMesg(encoder, { timestamp, event, eventType: 'marker', data });
    }
  }
}
