interface Utf8Decoder {
  decode(input: Uint8Array): string;
}
type Utf8DecoderClass = new (label: string, options?: { fatal?: boolean }) => Utf8Decoder;

/**
 * Decodes UTF-8 bytes with the host's TextDecoder (browsers, workers and Node all have it).
 * Returns undefined when `fatal` is set and the bytes are not valid UTF-8. A leading BOM is dropped.
 */
export function decodeUtf8(bytes: Uint8Array, fatal = false): string | undefined {
  // shared/ compiles without DOM or Node types, so the global is typed here locally.
  const Decoder = (globalThis as unknown as { TextDecoder: Utf8DecoderClass }).TextDecoder;
  try {
    return new Decoder('utf-8', { fatal }).decode(bytes);
  } catch {
    return undefined;
  }
}
