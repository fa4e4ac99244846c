import { Encoder, Profile, type FileIdMesg, type RecordMesg } from '@garmin/fitsdk';
import { emptyNotebook, type NotebookDocument } from '../../../shared/notebook/document.js';

/** A notebook document that passes the current schema, with optional overrides. */
export function notebookDoc(overrides: Partial<NotebookDocument> = {}): NotebookDocument {
  return { ...emptyNotebook('Spider vs pedals, 250 W steps'), ...overrides };
}

/** A small valid FIT activity written by the FIT SDK's own encoder (so header and CRCs are right by construction). */
export function fitBytes(seconds = 10, watts = 250): Uint8Array {
  const encoder = new Encoder();
  const start = new Date('2026-03-01T09:00:00Z');
  const fileId: FileIdMesg = { type: 'activity', manufacturer: 'development', product: 1, timeCreated: start, serialNumber: 4242 };
  encoder.writeMesg({ mesgNum: Profile.MesgNum.FILE_ID!, ...fileId });
  for (let i = 0; i < seconds; i++) {
    const record: RecordMesg = { timestamp: new Date(start.getTime() + i * 1000), power: watts + i, cadence: 90 };
    encoder.writeMesg({ mesgNum: Profile.MesgNum.RECORD!, ...record });
  }
  return encoder.close();
}
