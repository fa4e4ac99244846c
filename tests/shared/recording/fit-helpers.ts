import { Encoder, Profile, type EventMesg, type FileIdMesg, type RecordMesg } from '@garmin/fitsdk';

/** FIT seconds of a Unix ms time. 631065600 s = 1989-12-31T00:00:00Z (FIT SDK utils.js FIT_EPOCH_MS). */
export const fitSeconds = (ms: number): number => ms / 1000 - 631065600;

/** A tiny hand-made FIT activity: the given records and events, in the order given. */
export function handmadeFit(messages: ({ record: RecordMesg } | { event: EventMesg })[], fileId: FileIdMesg = { type: 'activity', manufacturer: 255, product: 5, serialNumber: 77 }): Uint8Array {
  const encoder = new Encoder();
  encoder.writeMesg({ mesgNum: Profile.MesgNum.FILE_ID!, ...fileId });
  for (const m of messages) {
    if ('record' in m) encoder.writeMesg({ mesgNum: Profile.MesgNum.RECORD!, ...m.record });
    else encoder.writeMesg({ mesgNum: Profile.MesgNum.EVENT!, ...m.event });
  }
  return encoder.close();
}

/** `count` records one second apart from `startMs`, with fields from `fill(i)`. */
export function records(count: number, startMs: number, fill: (i: number) => RecordMesg = (i) => ({ power: 200 + i })): { record: RecordMesg }[] {
  return Array.from({ length: count }, (_, i) => ({ record: { timestamp: fitSeconds(startMs) + i, ...fill(i) } }));
}
