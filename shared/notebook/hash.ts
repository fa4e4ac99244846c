import type { Recording } from '../recording/recording.js';

/**
 * 53-bit string hash (cyrb53 mixing: two 32-bit FNV-like lanes with Math.imul), as
 * hex. Used for cache keys, not for security: a collision only costs a stale result in
 * one session, and keys also include the config text itself where short.
 */
export function hashText(text: string, seed = 0): string {
  let h1 = 0xdeadbeef ^ seed;
  let h2 = 0x41c6ce57 ^ seed;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    h1 = Math.imul(h1 ^ c, 2654435761);
    h2 = Math.imul(h2 ^ c, 1597334677);
  }
  return mix(h1, h2);
}

function mix(a: number, b: number): string {
  let h1 = Math.imul(a ^ (a >>> 16), 2246822507) ^ Math.imul(b ^ (b >>> 13), 3266489909);
  let h2 = Math.imul(b ^ (b >>> 16), 2246822507) ^ Math.imul(h1 ^ (h1 >>> 13), 3266489909);
  h1 >>>= 0;
  h2 >>>= 0;
  return (h2 & 0x1fffff).toString(16).padStart(6, '0') + h1.toString(16).padStart(8, '0');
}

/** Hash of the bytes of typed arrays, 32 bits at a time. */
function hashArrays(arrays: Float64Array[], seed: number): string {
  let h1 = 0xdeadbeef ^ seed;
  let h2 = 0x41c6ce57 ^ seed;
  for (const a of arrays) {
    const words = new Uint32Array(a.buffer, a.byteOffset, a.length * 2);
    for (let i = 0; i < words.length; i++) {
      h1 = Math.imul(h1 ^ words[i]!, 2654435761);
      h2 = Math.imul(h2 ^ words[i]!, 1597334677);
    }
  }
  return mix(h1, h2);
}

/**
 * Content key of a recording: its sha256 when the host computed one (the original file
 * bytes), else a hash of its metadata, events and every column. O(n).
 */
export function hashRecording(recording: Recording): string {
  if (recording.meta.sha256) return `sha256:${recording.meta.sha256}`;
  let key = recordingKeys.get(recording);
  if (key === undefined) recordingKeys.set(recording, (key = hashContent(recording)));
  return key;
}

/** Keys of recordings already hashed (recordings are never changed once made). */
const recordingKeys = new WeakMap<Recording, string>();

function hashContent(recording: Recording): string {
  const names = Object.keys(recording.columns).sort();
  const arrays = [recording.time, ...names.map((k) => recording.columns[k as keyof typeof recording.columns]!)];
  return hashText(JSON.stringify({ meta: recording.meta, events: recording.events, names })) + hashArrays(arrays, 7);
}
