// Nibble table of the FIT CRC-16 (FIT SDK, "FIT File Protocol", CRC section).
const CRC_TABLE = [
  0x0000, 0xcc01, 0xd801, 0x1400, 0xf001, 0x3c00, 0x2800, 0xe401, 0xa001, 0x6c00, 0x7800, 0xb401, 0x5000, 0x9c01, 0x8801, 0x4400,
];

/** One byte through the SDK's two nibble steps. */
function nibbleStep(crc: number, byte: number): number {
  let tmp = CRC_TABLE[crc & 0xf]!;
  crc = (crc >>> 4) & 0x0fff;
  crc = crc ^ tmp ^ CRC_TABLE[byte & 0xf]!;
  tmp = CRC_TABLE[crc & 0xf]!;
  crc = (crc >>> 4) & 0x0fff;
  return crc ^ tmp ^ CRC_TABLE[(byte >>> 4) & 0xf]!;
}

// The same CRC a byte at a time: the two nibble steps of a byte are linear in (crc ^ byte),
// so crc' = (crc >>> 8) ^ BYTE_TABLE[(crc ^ byte) & 255], with the table built from those steps.
// One lookup per byte instead of four: the whole-file check of every import is a pass over every byte.
const BYTE_TABLE = Uint16Array.from({ length: 256 }, (_, i) => nibbleStep(0, i));

/**
 * FIT CRC-16 of `bytes[start, end)`, as the FIT SDK computes it for the header and file checksums.
 *
 * @example fitCrc(bytes, 0, 12) // header CRC of a 14-byte header
 */
export function fitCrc(bytes: Uint8Array, start = 0, end = bytes.length): number {
  let crc = 0;
  for (let i = start; i < end; i++) crc = (crc >>> 8) ^ BYTE_TABLE[(crc ^ bytes[i]!) & 0xff]!;
  return crc;
}
