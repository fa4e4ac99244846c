import type { DeviceIdentity } from './recording.js';
import type { FitParsedMessage } from './fit-events.js';

/** A raw message as fit-file-parser keeps it with `includeRawMessages`. */
export interface FitRawMessage {
  global_message_number: number;
  fields: { field_definition_number: number; raw_value: number[] }[];
}

const FILE_ID = 0;
const DEVICE_INFO = 23;

/**
 * Device identity from file_id and the creator's device_info: manufacturer name and id, product,
 * serial number and software version. Numeric ids come from the raw messages because the parser
 * turns them into names.
 */
export function fitDeviceIdentity(
  fileIds: readonly FitParsedMessage[],
  deviceInfos: readonly FitParsedMessage[],
  raw: readonly FitRawMessage[],
  creator: FitParsedMessage | undefined,
): DeviceIdentity {
  const fileId = fileIds[0];
  const info = deviceInfos.find((d) => d.device_index === 'creator' || d.device_index === 0) ?? deviceInfos[0];
  const rawId = raw.find((m) => m.global_message_number === FILE_ID);
  const rawInfo = raw.find((m) => m.global_message_number === DEVICE_INFO);
  const rawField = (m: FitRawMessage | undefined, num: number): number | undefined => {
    const v = m?.fields.find((f) => f.field_definition_number === num)?.raw_value[0];
    return typeof v === 'number' ? v : undefined;
  };
  const identity: DeviceIdentity = {};
  const manufacturer = fileId?.manufacturer ?? info?.manufacturer;
  if (typeof manufacturer === 'string') identity.manufacturer = manufacturer;
  const manufacturerId = rawField(rawId, 1) ?? rawField(rawInfo, 2) ?? (typeof manufacturer === 'number' ? manufacturer : undefined);
  if (manufacturerId !== undefined) identity.manufacturerId = manufacturerId;
  const productId = rawField(rawId, 2) ?? rawField(rawInfo, 4);
  if (productId !== undefined) identity.productId = productId;
  const productName = info?.product_name ?? fileId?.product_name;
  const product = typeof productName === 'string' ? productName : typeof fileId?.product === 'string' ? fileId.product : undefined;
  if (product) identity.product = product;
  const serial = fileId?.serial_number ?? info?.serial_number;
  if (typeof serial === 'number') identity.serialNumber = serial;
  const software = info?.software_version ?? creator?.software_version;
  // device_info's software_version is scaled by 100 (e.g. 2.31); file_creator's is an integer.
  if (typeof software === 'number') identity.softwareVersion = software.toFixed(info?.software_version !== undefined ? 2 : 0);
  return identity;
}
