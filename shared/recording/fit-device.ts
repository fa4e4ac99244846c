import type { DeviceIdentity } from './recording.js';
import type { FitParsedMessage } from './fit-events.js';

/**
 * Device identity from file_id and the creator's device_info: manufacturer name and id, product,
 * serial number and software version. Numeric ids come from the framing pass (`numbers`) because
 * the parser turns them into names.
 */
export function fitDeviceIdentity(
  fileIds: readonly FitParsedMessage[],
  deviceInfos: readonly FitParsedMessage[],
  numbers: { manufacturerId?: number; productId?: number } | undefined,
  creator: FitParsedMessage | undefined,
): DeviceIdentity {
  const fileId = fileIds[0];
  const info = deviceInfos.find((d) => d.device_index === 'creator' || d.device_index === 0) ?? deviceInfos[0];
  const identity: DeviceIdentity = {};
  const manufacturer = fileId?.manufacturer ?? info?.manufacturer;
  if (typeof manufacturer === 'string') identity.manufacturer = manufacturer;
  const manufacturerId = numbers?.manufacturerId ?? (typeof manufacturer === 'number' ? manufacturer : undefined);
  if (manufacturerId !== undefined) identity.manufacturerId = manufacturerId;
  const productId = numbers?.productId ?? (typeof fileId?.product === 'number' ? fileId.product : undefined);
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
